/** Benchmark cases of the space module (`space.` rows). */
import type { BenchCase } from './harness';

export function spaceCases(_quick: boolean): BenchCase[] {
  return [];
}
