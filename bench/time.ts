/** Benchmark cases of the time module (`time.` rows). */
import type { BenchCase } from './harness';

export function timeCases(_quick: boolean): BenchCase[] {
  return [];
}
