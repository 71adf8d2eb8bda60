/** Validation of the inner-solver choice and the options of `SpaceTimeSystem` (before any work). */
import { checkInteger, checkObject, checkOneOf, checkOptions } from '../validation/index';
import type { InnerSolver } from './fibre-inverse';
import type { SpaceTimeSystemOptions } from './space-time-system';

const SYSTEM_KEYS: Record<keyof Required<SpaceTimeSystemOptions>, true> = { inner: true, preconditionerInner: true, caches: true };

/** Checks an {@link InnerSolver}: `{ kind: 'multigrid', cycles?: 1…100 }` or `{ kind: 'exact' }`. */
export function validateInnerSolver(v: unknown, field: string): InnerSolver {
  const o = checkObject(v, field, "an inner solver { kind: 'multigrid', cycles? } or { kind: 'exact' }");
  const kind = checkOneOf(o.kind, `${field}.kind`, ['multigrid', 'exact'] as const);
  if (kind === 'exact') checkOptions(o, field, ['kind']);
  else {
    checkOptions(o, field, ['kind', 'cycles']);
    if (o.cycles !== undefined) checkInteger(o.cycles, `${field}.cycles`, 1, 100);
  }
  return o as InnerSolver;
}

/** Checks the options of the `SpaceTimeSystem` constructor. */
export function validateSystemOptions(opts: unknown, field = 'opts'): SpaceTimeSystemOptions {
  const o = checkOptions<SpaceTimeSystemOptions>(opts, field, SYSTEM_KEYS);
  if (o.inner !== undefined) validateInnerSolver(o.inner, `${field}.inner`);
  if (o.preconditionerInner !== undefined) validateInnerSolver(o.preconditionerInner, `${field}.preconditionerInner`);
  return o;
}
