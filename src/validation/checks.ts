/**
 * Argument checks shared by every public entry point. Each check throws an
 * {@link InvalidArgumentError} naming the argument or field exactly (e.g.
 * `opts.inner.kind`, `points[3]`), what was expected and what was received,
 * and returns the value narrowed to its type. Public wrappers call these
 * before doing any work; kernels below them stay unchecked.
 */
import { InvalidArgumentError, describeValue } from '../errors';
import { nearestName } from './names';

function fail(field: string, expected: string, received: unknown, extra = ''): never {
  throw new InvalidArgumentError(`${field} must be ${expected}, received ${describeValue(received)}${extra}`, {
    field,
    expected,
    received: typeof received === 'number' || typeof received === 'string' || typeof received === 'boolean' ? received : describeValue(received),
  });
}

/** Bounds of a numeric check. */
export interface NumberRange {
  /** Lower bound (inclusive unless `minOpen`). */
  min?: number;
  /** Upper bound (inclusive unless `maxOpen`). */
  max?: number;
  minOpen?: boolean;
  maxOpen?: boolean;
  /** Accept +∞ (e.g. an unlimited time budget). NaN and −∞ are never accepted. */
  allowInfinity?: boolean;
}

function rangeText(r: NumberRange, noun: string): string {
  const parts: string[] = [];
  if (r.min !== undefined) parts.push(`${r.minOpen ? '>' : '≥'} ${r.min}`);
  if (r.max !== undefined) parts.push(`${r.maxOpen ? '<' : '≤'} ${r.max}`);
  const fin = r.allowInfinity ? `${noun} (or Infinity)` : `a finite ${noun.replace(/^an? /, '')}`;
  return parts.length ? `${fin} ${parts.join(' and ')}` : fin;
}

function inRange(v: number, r: NumberRange): boolean {
  if (r.min !== undefined && (r.minOpen ? !(v > r.min) : !(v >= r.min))) return false;
  if (r.max !== undefined && (r.maxOpen ? !(v < r.max) : !(v <= r.max))) return false;
  return true;
}

/** A number (typeof 'number', never a numeric string), finite unless `allowInfinity`, within the range. */
export function checkNumber(v: unknown, field: string, range: NumberRange = {}): number {
  const ok = typeof v === 'number' && (Number.isFinite(v) || (range.allowInfinity === true && v === Infinity)) && inRange(v, range);
  if (!ok) fail(field, rangeText(range, 'a number'), v);
  return v as number;
}

/** An integer (typeof 'number') in [min, max]. */
export function checkInteger(v: unknown, field: string, min: number, max: number): number {
  if (typeof v !== 'number' || !Number.isInteger(v) || v < min || v > max) fail(field, `an integer in [${min}, ${max}]`, v);
  return v as number;
}

/** A boolean (true/false only). */
export function checkBoolean(v: unknown, field: string): boolean {
  if (typeof v !== 'boolean') fail(field, 'true or false', v);
  return v as boolean;
}

/** A string. */
export function checkString(v: unknown, field: string, maxLength = 10_000): string {
  if (typeof v !== 'string' || v.length > maxLength) fail(field, `a string of at most ${maxLength} characters`, v);
  return v as string;
}

/** One of the listed literal values; a near miss gets a suggestion. */
export function checkOneOf<T extends string | number>(v: unknown, field: string, values: readonly T[]): T {
  if (!values.includes(v as T)) {
    const hint = typeof v === 'string' ? nearestName(v, values.map(String)) : undefined;
    fail(field, `one of ${values.map((x) => JSON.stringify(x)).join(', ')}`, v, hint ? ` (did you mean ${JSON.stringify(hint)}?)` : '');
  }
  return v as T;
}

/** A function; `signature` describes it in the message, e.g. `'a function (x, y) => number'`. */
export function checkFunction<F extends (...args: never[]) => unknown>(v: unknown, field: string, signature = 'a function'): F {
  if (typeof v !== 'function') fail(field, signature, v);
  return v as F;
}

/** An instance of `cls`; `what` names it for the message, e.g. `'a SpatialDomain (from rectangleDomain, …)'`. */
export function checkInstance<T>(v: unknown, cls: abstract new (...args: never[]) => T, field: string, what: string): T {
  if (!(v instanceof cls)) fail(field, what, v);
  return v as T;
}

/** An AbortSignal, or any object with a boolean `aborted` (signals from other realms or polyfills). */
export function checkAbortSignal(v: unknown, field: string): { aborted: boolean } {
  if (v === null || typeof v !== 'object' || typeof (v as { aborted?: unknown }).aborted !== 'boolean') fail(field, 'an AbortSignal', v);
  return v as { aborted: boolean };
}

/** A plain object (not null, not an array, not a function). */
export function checkObject(v: unknown, field: string, what = 'an object'): Record<string, unknown> {
  if (v === null || typeof v !== 'object' || Array.isArray(v) || ArrayBuffer.isView(v)) fail(field, what, v);
  return v as Record<string, unknown>;
}

/**
 * An options object whose keys are all in `allowed` (the keys of the options type). `undefined`
 * means "all defaults" and gives `{}`. An unknown key is refused with the nearest valid name.
 * Keys whose value is `undefined` count as absent.
 */
export function checkOptions<T extends object>(v: unknown, field: string, allowed: Readonly<Record<keyof T, unknown>> | readonly string[]): Partial<T> {
  if (v === undefined) return {};
  const keys = Array.isArray(allowed) ? (allowed as readonly string[]) : Object.keys(allowed);
  const o = checkObject(v, field, `an options object with keys among ${keys.join(', ')}`);
  for (const k of Object.keys(o)) {
    if (!keys.includes(k)) {
      const hint = nearestName(k, keys);
      throw new InvalidArgumentError(
        `${field} has an unknown option '${k}'${hint ? ` (did you mean '${hint}'?)` : ''}; valid options: ${keys.join(', ')}`,
        { field: `${field}.${k}`, expected: `one of ${keys.join(', ')}`, received: k },
      );
    }
  }
  return o as Partial<T>;
}

/**
 * An array-like of numbers (plain array or typed array; strings, holes and other values refused),
 * optionally of an exact length and all finite. Returns it unchanged.
 */
export function checkNumberArray(
  v: unknown,
  field: string,
  opts: { length?: number; finite?: boolean; minLength?: number; maxLength?: number } = {},
): ArrayLike<number> {
  const isTyped = ArrayBuffer.isView(v) && !(v instanceof DataView);
  if (!isTyped && !Array.isArray(v)) fail(field, 'an array of numbers', v);
  const a = v as ArrayLike<unknown>;
  if (opts.length !== undefined && a.length !== opts.length) {
    throw new InvalidArgumentError(`${field} has length ${a.length}, expected ${opts.length}`, { field, expected: `length ${opts.length}`, received: a.length });
  }
  if (opts.minLength !== undefined && a.length < opts.minLength) {
    throw new InvalidArgumentError(`${field} has length ${a.length}, expected at least ${opts.minLength}`, { field, expected: `length ≥ ${opts.minLength}`, received: a.length });
  }
  if (opts.maxLength !== undefined && a.length > opts.maxLength) {
    throw new InvalidArgumentError(`${field} has length ${a.length}, expected at most ${opts.maxLength}`, { field, expected: `length ≤ ${opts.maxLength}`, received: a.length });
  }
  const finite = opts.finite ?? true;
  if (isTyped && !finite) return a as ArrayLike<number>;
  for (let i = 0; i < a.length; i++) {
    const x = a[i];
    if (typeof x !== 'number' && typeof x !== 'bigint') fail(`${field}[${i}]`, 'a number', x);
    if (finite && !Number.isFinite(x)) fail(`${field}[${i}]`, 'a finite number', x);
  }
  return a as ArrayLike<number>;
}

/** A Float64Array, optionally of exact length and all finite. */
export function checkFloat64Array(v: unknown, field: string, opts: { length?: number; finite?: boolean } = {}): Float64Array {
  if (!(v instanceof Float64Array)) fail(field, `a Float64Array${opts.length !== undefined ? ` of length ${opts.length}` : ''}`, v);
  checkNumberArray(v, field, opts);
  return v as Float64Array;
}

/** An Int32Array, optionally of exact length. */
export function checkInt32Array(v: unknown, field: string, opts: { length?: number } = {}): Int32Array {
  if (!(v instanceof Int32Array)) fail(field, `an Int32Array${opts.length !== undefined ? ` of length ${opts.length}` : ''}`, v);
  if (opts.length !== undefined && (v as Int32Array).length !== opts.length) {
    throw new InvalidArgumentError(`${field} has length ${(v as Int32Array).length}, expected ${opts.length}`, { field, expected: `length ${opts.length}`, received: (v as Int32Array).length });
  }
  return v as Int32Array;
}

/** A linear operator `{ inSize, outSize, apply(x, y) }`; with `square` inSize must equal outSize; with `size` both must equal it. */
export function checkLinearOperator(v: unknown, field: string, opts: { square?: boolean; size?: number } = {}): { inSize: number; outSize: number; apply: (x: Float64Array, y: Float64Array) => void } {
  const o = checkObject(v, field, 'a linear operator { inSize, outSize, apply(x, y) }');
  const inSize = checkInteger(o.inSize, `${field}.inSize`, 0, 2 ** 31 - 1);
  const outSize = checkInteger(o.outSize, `${field}.outSize`, 0, 2 ** 31 - 1);
  checkFunction(o.apply, `${field}.apply`, 'a function apply(x, y)');
  if (opts.size !== undefined) {
    if (inSize !== opts.size) throw new InvalidArgumentError(`${field}.inSize = ${inSize}, expected ${opts.size}`, { field: `${field}.inSize`, expected: String(opts.size), received: inSize });
    if (outSize !== opts.size) throw new InvalidArgumentError(`${field}.outSize = ${outSize}, expected ${opts.size}`, { field: `${field}.outSize`, expected: String(opts.size), received: outSize });
  } else if (opts.square && inSize !== outSize) {
    throw new InvalidArgumentError(`${field} must be square, but inSize = ${inSize} ≠ outSize = ${outSize}`, { field: `${field}.outSize`, expected: `= inSize (${inSize})`, received: outSize });
  }
  return o as never;
}

/**
 * The value returned by a user callback must be a finite number; otherwise the error names the
 * callback and the point it was called at, e.g. `exact.value(0.5, 0.25, 0)`.
 */
export function checkCallbackResult(v: unknown, callback: string, args: readonly number[]): number {
  if (typeof v !== 'number' || !Number.isFinite(v)) {
    const call = `${callback}(${args.map((a) => String(a)).join(', ')})`;
    throw new InvalidArgumentError(`${call} returned ${describeValue(v)}; expected a finite number`, { field: callback, expected: 'a finite number', received: describeValue(v) });
  }
  return v;
}
