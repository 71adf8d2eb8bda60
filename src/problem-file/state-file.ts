/**
 * State files (JSON): a field u(x) given by values at the points of a triangulation (segments in
 * 1D), to start a problem from — the end state of an earlier run (`chronomesh solve --out DIR`
 * writes DIR/end-state.json) or a field measured or computed elsewhere. Layout:
 *
 * ```json
 * { "format": "chronomesh-state", "version": 1, "time": 0.3, "description": "…",
 *   "points": [[0, 0], [1, 0], [1, 1]], "cells": [[0, 1, 2]], "values": [20, 21.5, 20.2] }
 * ```
 *
 * In 1D a point is a number and a cell two indices. `format`, `version`, `time` and `description`
 * are optional (written for the reader's information; the run starts at t = 0 whatever `time`
 * says). Every error names the field path, e.g. `initial.state.cells[12][2]`.
 */
import { ChronomeshError, NodalField } from './core';
import { bad, checkKeys, typeName } from './field-errors';

/** The `format` string of a state file. */
export const STATE_FORMAT = 'chronomesh-state';
const STATE_VERSION = 1;
const STATE_FIELDS = ['format', 'version', 'time', 'description', 'points', 'cells', 'values'];

/**
 * The JSON text of a state file for `field`, with the time it holds and an optional description.
 *
 * @example
 * ```ts
 * import { parseState, stateToJson } from 'chronomesh/problem-file';
 * const field = parseState({ points: [0, 0.5, 1], cells: [[0, 1], [1, 2]], values: [0, 1, 0] }, 'state', 1);
 * console.log(stateToJson(field, 0.3)); // → {"format":"chronomesh-state","version":1,"time":0.3,"points":[0,0.5,1],"cells":[[0,1],[1,2]],"values":[0,1,0]}
 * ```
 */
export function stateToJson(field: NodalField, time: number, description?: string): string {
  const d = field.dim, nv = d + 1;
  const points: string[] = [];
  for (let i = 0; i < field.pointCount; i++) points.push(d === 1 ? String(field.points[i]) : `[${field.points[2 * i]},${field.points[2 * i + 1]}]`);
  const cells: string[] = [];
  for (let e = 0; e < field.cellCount; e++) cells.push(`[${Array.from(field.cells.subarray(nv * e, nv * e + nv)).join(',')}]`);
  const head = JSON.stringify({ format: STATE_FORMAT, version: STATE_VERSION, time, ...(description !== undefined ? { description } : {}) });
  return `${head.slice(0, -1)},"points":[${points.join(',')}],"cells":[${cells.join(',')}],"values":[${Array.from(field.values).join(',')}]}`;
}

/**
 * A {@link NodalField} from the parsed JSON of a state file, checked field by field; `where` is
 * the path of the state in the enclosing document (for error messages), `dim` the dimension the
 * caller needs.
 *
 * @example
 * ```ts
 * import { parseState } from 'chronomesh/problem-file';
 * const u0 = parseState({ points: [[0, 0], [1, 0], [0, 1]], cells: [[0, 1, 2]], values: [1, 2, 3] }, 'state', 2);
 * console.log(u0.valueAt(0.5, 0.5)); // → 2.5
 * ```
 */
export function parseState(json: unknown, where: string, dim: 1 | 2): NodalField {
  if (json === null || typeof json !== 'object' || Array.isArray(json)) bad(where, `must be a state object { points, cells, values }, found ${typeName(json)}`, json);
  const o = json as Record<string, unknown>;
  checkKeys(o, STATE_FIELDS, where);
  if (o.format !== undefined && o.format !== STATE_FORMAT) bad(`${where}.format`, `must be "${STATE_FORMAT}", found ${JSON.stringify(o.format)}`, o.format);
  if (o.version !== undefined && o.version !== STATE_VERSION) bad(`${where}.version`, `must be ${STATE_VERSION} (the one version this build reads), found ${JSON.stringify(o.version)}`, o.version);
  if (o.time !== undefined && (typeof o.time !== 'number' || !Number.isFinite(o.time))) bad(`${where}.time`, `must be a finite number, found ${typeName(o.time)}`, o.time);
  if (o.description !== undefined && typeof o.description !== 'string') bad(`${where}.description`, `must be a string, found ${typeName(o.description)}`, o.description);
  const list = (name: string): unknown[] => {
    const v = o[name];
    if (!Array.isArray(v) || v.length === 0) bad(`${where}.${name}`, `must be a non-empty list, found ${typeName(v)}`, v);
    return v;
  };
  const finite = (v: unknown, field: string): number => {
    if (typeof v !== 'number' || !Number.isFinite(v)) bad(field, `must be a finite number, found ${typeName(v)}`, v);
    return v;
  };
  const pts = list('points');
  const own = Array.isArray(pts[0]) ? pts[0].length : 1;
  if (own !== dim && (own === 1 || own === 2)) {
    bad(`${where}.points`, `holds ${own}D points (${own === 1 ? 'numbers x' : '[x, y]'}), but the problem is ${dim}D`, own);
  }
  const points = new Float64Array(dim * pts.length);
  pts.forEach((p, i) => {
    const f = `${where}.points[${i}]`;
    if (dim === 1) {
      points[i] = finite(p, f);
    } else {
      if (!Array.isArray(p) || p.length !== 2) bad(f, `must be a point [x, y], found ${typeName(p)}`, p);
      points[2 * i] = finite(p[0], `${f}[0]`);
      points[2 * i + 1] = finite(p[1], `${f}[1]`);
    }
  });
  const nv = dim + 1;
  const cs = list('cells');
  const cells = new Int32Array(nv * cs.length);
  cs.forEach((c, e) => {
    const f = `${where}.cells[${e}]`;
    if (!Array.isArray(c) || c.length !== nv) bad(f, `must be ${nv} point indices ${dim === 1 ? '[i, j]' : '[i, j, k]'}, found ${typeName(c)}`, c);
    c.forEach((k: unknown, j) => {
      if (typeof k !== 'number' || !Number.isInteger(k) || k < 0 || k >= pts.length) bad(`${f}[${j}]`, `must be a point index in [0, ${pts.length - 1}], found ${typeName(k)}`, k);
      cells[nv * e + j] = k;
    });
  });
  const vs = list('values');
  if (vs.length !== pts.length) bad(`${where}.values`, `has ${vs.length} values for ${pts.length} points (one value per point)`, vs.length);
  const values = Float64Array.from(vs, (v, i) => finite(v, `${where}.values[${i}]`));
  try {
    return new NodalField({ dim, points, cells, values });
  } catch (e) {
    // a degenerate cell: name it with the state's path
    if (e instanceof ChronomeshError) bad(`${where}.cells`, e.message, e.received);
    throw e;
  }
}
