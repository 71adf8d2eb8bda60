/** Registry of benchmark suites; each module contributes one function returning its cases. */
import type { BenchCase } from './harness';

export type Suite = (quick: boolean) => BenchCase[];

export const suites: Suite[] = [];
