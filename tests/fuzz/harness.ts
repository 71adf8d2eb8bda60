/**
 * Harness of the property-based robustness suite: every public entry is called with valid
 * arguments or with exactly one argument (or option field) replaced by a hostile value, drawn by
 * fast-check from a fixed seed. Each call is classified:
 *  - ok: valid input → finite result; corrupted input → a ChronomeshError whose `field` names the
 *    corrupted argument or field;
 *  - untyped: anything thrown that is not a ChronomeshError (TypeError, RangeError, …);
 *  - nan: a result holding NaN/±∞ (numbers, typed arrays, "NaN"/"Infinity" in text output);
 *  - slow: a call that took longer than the hang limit;
 *  - accepted: corrupted input that returned normally (silently accepted);
 *  - wrongField: a typed error whose field does not name the corrupted argument;
 *  - refusedValid: a typed error for an input the case generator considers valid.
 */
import fc from 'fast-check';
import { ChronomeshError } from '../../src/index';

/** Hostile values any number-typed argument must refuse (never coerce). */
export const BAD_NUMBER: unknown[] = [NaN, Infinity, -Infinity, '1', '', null, true, {}, [], [1], 1n, Symbol('s'), () => 1];
/** Hostile values for an object-typed (options) argument. */
export const BAD_OBJECT: unknown[] = [5, 'x', true, 1n, Symbol('o'), [1], () => 1];
/** Hostile values for a function-typed argument. */
export const BAD_FUNCTION: unknown[] = [5, 'x', null, {}, [], true, 1n];

/** One argument (or option field) of an entry. */
export interface Slot {
  name: string;
  valid: fc.Arbitrary<unknown>;
  invalid: fc.Arbitrary<unknown>;
  /** The field of the typed error must match this. */
  field: RegExp;
}

/** A public entry point under test. */
export interface Entry {
  name: string;
  slots: Slot[];
  call: (args: unknown[]) => unknown;
  /** Runs per seed (default 16). */
  runs?: number;
}

export type Outcome = 'ok' | 'untyped' | 'nan' | 'slow' | 'accepted' | 'wrongField' | 'refusedValid';

export interface Tally {
  cases: number;
  corrupted: number;
  counts: Record<Outcome, number>;
  /** First few bad cases, for the failure message (entry, slot, value, what happened). */
  bad: string[];
}

export function newTally(): Tally {
  return { cases: 0, corrupted: 0, counts: { ok: 0, untyped: 0, nan: 0, slow: 0, accepted: 0, wrongField: 0, refusedValid: 0 }, bad: [] };
}

/** True if a result contains a non-finite number anywhere reachable (bounded depth). */
export function hasNonFinite(v: unknown, depth = 0, seen = new Set<unknown>()): boolean {
  if (typeof v === 'number') return !Number.isFinite(v);
  if (typeof v === 'string') return /\bNaN\b|\bInfinity\b/.test(v);
  if (v === null || typeof v !== 'object' || depth > 4 || seen.has(v)) return false;
  seen.add(v);
  if (ArrayBuffer.isView(v)) {
    if (v instanceof Float64Array || v instanceof Float32Array) {
      for (let i = 0; i < v.length; i++) if (!Number.isFinite(v[i]!)) return true;
    }
    return false;
  }
  if (Array.isArray(v)) return v.slice(0, 10000).some((x) => hasNonFinite(x, depth + 1, seen));
  for (const k of Object.keys(v)) {
    if (hasNonFinite((v as Record<string, unknown>)[k], depth + 1, seen)) return true;
  }
  return false;
}

function show(v: unknown): string {
  if (typeof v === 'symbol') return v.toString();
  if (typeof v === 'bigint') return `${v}n`;
  if (typeof v === 'function') return 'function';
  try {
    const s = JSON.stringify(v, (_k, x) => (typeof x === 'number' && !Number.isFinite(x) ? String(x) : typeof x === 'bigint' ? `${x}n` : x));
    return s === undefined ? String(v) : s.length > 80 ? s.slice(0, 80) + '…' : s;
  } catch {
    return typeof v;
  }
}

/** Classifies one call. */
export function runCase(entry: Entry, args: unknown[], corrupt: number, tally: Tally, hangMs: number): void {
  tally.cases++;
  if (corrupt >= 0) tally.corrupted++;
  const where = corrupt >= 0 ? `${entry.name} with ${entry.slots[corrupt]!.name} = ${show(args[corrupt])}` : `${entry.name} (valid: ${args.map(show).join(', ')})`;
  const t0 = performance.now();
  let outcome: Outcome = 'ok';
  let detail = '';
  try {
    const r = entry.call(args);
    if (corrupt >= 0) outcome = 'accepted';
    else if (hasNonFinite(r)) outcome = 'nan';
  } catch (e) {
    if (!(e instanceof ChronomeshError)) {
      outcome = 'untyped';
      detail = `${(e as Error)?.name}: ${(e as Error)?.message}`;
    } else if (corrupt < 0) {
      outcome = 'refusedValid';
      detail = `${e.name} field=${e.field}: ${e.message}`;
    } else if (!(e.field !== undefined && entry.slots[corrupt]!.field.test(e.field))) {
      outcome = 'wrongField';
      detail = `field=${e.field}: ${e.message}`;
    }
  }
  const ms = performance.now() - t0;
  if (outcome === 'ok' && ms > hangMs) {
    outcome = 'slow';
    detail = `${ms.toFixed(0)} ms`;
  }
  tally.counts[outcome]++;
  if (outcome !== 'ok' && tally.bad.length < 400) tally.bad.push(`[${outcome}] ${where}${detail ? ` → ${detail}` : ''}`);
}

/** Runs `entry` for `runs` seeded cases: about a third valid, the rest with one slot corrupted. */
export function fuzzEntry(entry: Entry, seed: number, tally: Tally, hangMs = 3000): void {
  const n = entry.slots.length;
  const arb = fc.tuple(
    fc.integer({ min: -Math.max(1, Math.ceil(n / 2)), max: n - 1 }),
    fc.tuple(...entry.slots.map((s) => s.valid)),
    fc.tuple(...entry.slots.map((s) => s.invalid)),
  );
  fc.assert(
    fc.property(arb, ([which, valid, invalid]) => {
      const corrupt = which < 0 ? -1 : which;
      const args = [...valid];
      if (corrupt >= 0) args[corrupt] = invalid[corrupt];
      runCase(entry, args, corrupt, tally, hangMs);
      return true;
    }),
    { seed, numRuns: entry.runs ?? 16 },
  );
}
