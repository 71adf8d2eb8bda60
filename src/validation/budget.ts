/**
 * The memory budget: requests that can grow (uniform and sparse grids, mesh generators,
 * refinement, grid sampling, space-time systems) estimate their memory before allocating and
 * are refused with a {@link ResourceLimitError} stating the estimate and the budget when it is
 * exceeded. The default budget is half of the machine's physical memory where Node.js reports it
 * (`os.totalmem()`), otherwise 2 GiB; {@link setMemoryBudget} overrides it.
 *
 * The per-item byte counts below are measured peaks (resident set size growth over the request,
 * Node 20, 2 cores shared with other work) rounded up; they are estimates, not guarantees.
 */
import { InvalidArgumentError, ResourceLimitError, describeValue } from '../errors';

/** Peak bytes per unknown of a space-time system with its solve (measured 0.7–1.2 KB, 1D and 2D sparse grids). */
export const BYTES_PER_SYSTEM_UNKNOWN = 800;
/** Bytes per vertex of the bisection forest, with its elements and growth slack (measured ≈ 310 B in 2D). */
export const BYTES_PER_FOREST_VERTEX = 350;
/** Peak bytes per triangle while a user triangulation is validated and labelled (measured ≈ 560 B). */
export const BYTES_PER_INPUT_TRIANGLE = 600;
/** Peak bytes per interval cell of the 1D initial mesh (measured ≈ 190 B). */
export const BYTES_PER_INPUT_CELL = 200;

const FALLBACK_BUDGET = 2 * 1024 ** 3;
let override: number | null = null;
let cachedDefault: number | null = null;

function defaultBudget(): number {
  if (cachedDefault !== null) return cachedDefault;
  let total = 0;
  try {
    const proc = (globalThis as { process?: { getBuiltinModule?: (id: string) => unknown } }).process;
    const os = proc?.getBuiltinModule?.('node:os') as { totalmem?: () => number } | undefined;
    total = os?.totalmem?.() ?? 0;
  } catch {
    total = 0;
  }
  cachedDefault = total > 0 ? 0.5 * total : FALLBACK_BUDGET;
  return cachedDefault;
}

/**
 * The memory budget in bytes that growing requests are checked against.
 *
 * @example
 * ```ts
 * import { memoryBudget } from 'chronomesh';
 * console.log((memoryBudget() / 1024 ** 3).toFixed(1), 'GiB'); // half the machine's memory by default
 * ```
 */
export function memoryBudget(): number {
  return override ?? defaultBudget();
}

/**
 * Sets the memory budget in bytes (e.g. for a worker with less memory, or a big server run);
 * `null` restores the default (half of physical memory). Returns the previous override.
 *
 * @example
 * ```ts
 * import { ResourceLimitError, memoryBudget, rectangleDomain, setMemoryBudget } from 'chronomesh';
 * const previous = setMemoryBudget(64 * 1024 ** 2); // 64 MiB
 * try { rectangleDomain(0, 1, 0, 1, 2, 2).uniformSet(12); }
 * catch (e) { console.log(e instanceof ResourceLimitError); } // → true
 * finally { setMemoryBudget(previous); }
 * console.log(memoryBudget() > 64 * 1024 ** 2);
 * ```
 */
export function setMemoryBudget(bytes: number | null): number | null {
  if (bytes !== null && !(typeof bytes === 'number' && Number.isFinite(bytes) && bytes > 0)) {
    throw new InvalidArgumentError(`bytes must be a finite number > 0 or null, received ${describeValue(bytes)}`, {
      field: 'bytes',
      expected: 'a finite number > 0, or null for the default',
      received: bytes,
    });
  }
  const prev = override;
  override = bytes;
  return prev;
}

/** Human-readable byte count (binary units). */
export function formatBytes(b: number): string {
  if (!Number.isFinite(b)) return String(b);
  const units = ['B', 'KiB', 'MiB', 'GiB', 'TiB', 'PiB', 'EiB'];
  let i = 0;
  while (b >= 1024 && i < units.length - 1) {
    b /= 1024;
    i++;
  }
  return `${b < 10 && i > 0 ? b.toFixed(1) : Math.round(b)} ${units[i]}`;
}

/**
 * Refuses a request whose memory estimate exceeds the budget. `what` describes the request
 * ("uniform set of level 40"), `field` is the argument that drives its size.
 */
export function checkMemory(estimateBytes: number, what: string, field: string, advice = 'choose a smaller size'): void {
  const budget = memoryBudget();
  if (!(estimateBytes <= budget)) {
    throw new ResourceLimitError(
      `${what} would need about ${formatBytes(estimateBytes)}, more than the memory budget of ${formatBytes(budget)}; ` +
        `${advice}, or raise the budget with setMemoryBudget(bytes)`,
      estimateBytes,
      budget,
      { field, expected: `a request within ${formatBytes(budget)}`, received: formatBytes(estimateBytes) },
    );
  }
}
