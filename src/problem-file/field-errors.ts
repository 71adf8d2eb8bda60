/**
 * Errors of the problem-file layer: every one an InvalidArgumentError whose message starts with the
 * field path (`domain.cells`, `initial.state.cells[3][1]`) and says what was found.
 */
import { InvalidArgumentError } from '../errors';
import { nearestName } from './nearest-name';

/** Throws the error of `field`. @internal */
export function bad(field: string, message: string, received?: unknown): never {
  throw new InvalidArgumentError(`${field}: ${message}`, { field, received });
}

/** What a JSON value is, in words, for messages. @internal */
export function typeName(v: unknown): string {
  if (v === null) return 'null';
  if (v === undefined) return 'nothing (the field is missing)';
  if (Array.isArray(v)) return 'an array';
  if (typeof v === 'string') return `the string ${JSON.stringify(v.length > 30 ? v.slice(0, 30) + '…' : v)}`;
  if (typeof v === 'object') return 'an object';
  return `${typeof v} ${String(v)}`;
}

/** Refuses unknown keys of `obj`, suggesting the nearest valid one. @internal */
export function checkKeys(obj: Record<string, unknown>, allowed: readonly string[], where: string): void {
  for (const k of Object.keys(obj)) {
    if (allowed.includes(k)) continue;
    const hint = nearestName(k, allowed);
    bad(where ? `${where}.${k}` : k, `unknown field${hint ? `; did you mean '${hint}'?` : ''} (valid: ${allowed.join(', ')})`, k);
  }
}
