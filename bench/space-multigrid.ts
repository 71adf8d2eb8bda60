/** Benchmark cases of the spatial multilevel preconditioner (`space.vcycle*` rows). */
import type { BenchCase } from './harness';

export function spaceMultigridCases(_quick: boolean): BenchCase[] {
  return [];
}
