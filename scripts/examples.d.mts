/** Types of scripts/examples.mjs (used by tests/docs/examples.test.ts). */
export interface Example { file: string; line: number; code: string }
export function tsdocExamples(root: string): Example[];
export function readmeBlocks(root: string): Example[];
/** Lines of an example that state their output (`console.log(…); // → expected`): 1-based line in the block and the expected text. */
export function statedOutputs(code: string): { line: number; expected: string }[];
/** Lines that look like an output claim without the `// →` marker (a value right after `console.log(…); //`). */
export function unmarkedClaims(code: string): number[];
/** True when the printed output matches the stated one (numbers to the digits stated). */
export function outputMatches(actual: string, expected: string): boolean;
