/**
 * Pictures of a space-time index set (a trial double tree) as standalone SVG.
 *
 * 1D: the (t, x) plane with the support of every trial function σ_λ ⊗ φ_ν drawn as the outline of
 * a rectangle (temporal support × spatial support), so refinement towards t = 0 and towards the
 * boundary shows as a denser pattern of lines; optionally with a logarithmic time axis.
 * 2D: the number of unknowns per temporal level and per spatial generation, and the spatial leaf
 * mesh active at chosen times (the union of the fibres of the temporal functions alive at t).
 */
import { InvalidArgumentError } from '../errors';
import { nodeSupport } from '../time/index';
import type { SpatialDomain } from '../space/index';
import type { DoubleTree } from '../spacetime/double-tree';
import { unionSorted } from '../spacetime/fibre-pool';
import { axesSvg, escapeXml, frameX, frameY, type PlotFrame } from './svg-common';

/** Options of {@link indexSetToSvg}. */
export interface IndexSetSvgOptions {
  title?: string;
  /** 1D: logarithmic time axis (default false). */
  logTime?: boolean;
  /** 2D: times at which the active spatial mesh is drawn (default T/1000, T/10, T). */
  times?: number[];
  /** Width in pixels (default 640 in 1D, 900 in 2D). */
  width?: number;
  /** 1D: at most this many supports are drawn (default 40000); the picture says when more exist. */
  maxSupports?: number;
  /**
   * The time at which the set's clock starts (default 0), for a run that continues another: the
   * labels show absolute times start + t. `times` stay on the set's clock, in [0, T].
   */
  start?: number;
}

const f2 = (v: number) => v.toFixed(2);

function open(W: number, H: number, title: string | undefined): string[] {
  const out = [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" font-family="DejaVu Sans, Arial, sans-serif" font-size="12">`,
    '<rect width="100%" height="100%" fill="white"/>',
  ];
  if (title) out.push(`<text class="title" x="${W / 2}" y="22" text-anchor="middle" font-size="15">${escapeXml(title)}</text>`);
  return out;
}

/**
 * An SVG picture of the trial index set `set` on `domain` over (0, T).
 *
 * @example
 * ```ts
 * import { DoubleTree, indexSetToSvg, intervalDomain } from 'chronomesh';
 * const domain = intervalDomain(0, 1, 2);
 * const svg = indexSetToSvg(domain, DoubleTree.sparseGrid(domain, 5), 1, { logTime: true, title: 'sparse grid, level 5' });
 * ```
 */
export function indexSetToSvg(domain: SpatialDomain, set: DoubleTree, T: number, opts: IndexSetSvgOptions = {}): string {
  if (!(T > 0 && Number.isFinite(T))) throw new InvalidArgumentError(`T = ${T} must be a finite number > 0`, { field: 'T', received: T });
  if (opts.start !== undefined && !(typeof opts.start === 'number' && Number.isFinite(opts.start))) {
    throw new InvalidArgumentError(`opts.start = ${String(opts.start)} must be a finite number`, { field: 'opts.start', received: String(opts.start) });
  }
  return domain.dim === 1 ? plane1d(domain, set, T, opts) : levels2d(domain, set, T, opts);
}

function temporalSupport(set: DoubleTree, node: number, T: number, s: Float64Array): [number, number] {
  const l = set.tree.level[node]!;
  nodeSupport(set.kind, l, set.tree.index[node]!, s);
  const h = T * 2 ** -l;
  return [Math.max(0, s[0]! * h), Math.min(T, s[1]! * h)];
}

function plane1d(domain: SpatialDomain, set: DoubleTree, T: number, opts: IndexSetSvgOptions): string {
  const forest = domain.forest;
  const nInit = domain.initialVertexCount;
  const initX = Array.from(forest.vCoord.subarray(0, nInit)).sort((a, b) => a - b);
  const xmin = initX[0]!, xmax = initX[initX.length - 1]!;
  const spatialSupport = (v: number): [number, number] => {
    if (v >= nInit) {
      const a = forest.vCoord[forest.vParentA[v]!]!, b = forest.vCoord[forest.vParentB[v]!]!;
      return a < b ? [a, b] : [b, a];
    }
    const x = forest.vCoord[v]!;
    const k = initX.indexOf(x);
    return [initX[Math.max(0, k - 1)]!, initX[Math.min(initX.length - 1, k + 1)]!];
  };
  const log = opts.logTime ?? false;
  const tmin = T * 2 ** -(set.tree.maxLevel + 1);
  const tx = (t: number) => (log ? Math.log10(Math.max(t, tmin)) : t);
  const W = opts.width ?? 640;
  const left = 64, right = 24, top = 40, bottom = 56;
  const plotW = W - left - right, plotH = Math.round(plotW * 0.55);
  const f: PlotFrame = { left, top, width: plotW, height: plotH, x0: tx(log ? tmin : 0), x1: tx(T), y0: xmin, y1: xmax };
  const H = top + plotH + bottom;
  const out = open(W, H, opts.title);
  const limit = opts.maxSupports ?? 40000;
  const s = new Float64Array(2);
  let drawn = 0;
  out.push(`<defs><clipPath id="plot-area"><rect x="${left}" y="${top}" width="${plotW}" height="${plotH}"/></clipPath></defs>`);
  out.push('<g class="supports" clip-path="url(#plot-area)" fill="none" stroke="#1f4e99" stroke-opacity="0.3" stroke-width="0.6">');
  for (let i = 0; i < set.tree.size && drawn < limit; i++) {
    const [t0, t1] = temporalSupport(set, i, T, s);
    const fib = set.fibre(i);
    const X0 = frameX(f, tx(t0)), X1 = frameX(f, tx(t1));
    for (let p = 0; p < fib.length && drawn < limit; p++, drawn++) {
      const [a, b] = spatialSupport(fib[p]!);
      const Y0 = frameY(f, b), Y1 = frameY(f, a);
      out.push(`<rect x="${f2(X0)}" y="${f2(Y0)}" width="${f2(Math.max(0.3, X1 - X0))}" height="${f2(Math.max(0.3, Y1 - Y0))}"/>`);
    }
  }
  out.push('</g>');
  const xTicks: number[] = [];
  if (log) for (let k = Math.ceil(f.x0); k <= Math.floor(f.x1); k++) xTicks.push(k);
  const start = opts.start ?? 0;
  // a logarithmic axis shows the time since the start; a linear one absolute times
  const xLabel = log ? (start !== 0 ? `t − ${start} (logarithmic)` : 't (logarithmic)') : 't';
  const linearTicks = start !== 0 ? { xTickLabel: (v: number) => String(Number((start + v).toPrecision(6))) } : {};
  out.push(axesSvg(f, xLabel, 'x', log ? { xTicks, xTickLabel: (k) => (k === 0 ? '1' : `1e${k}`) } : linearTicks));
  const note = `${set.size} unknowns, deepest temporal level ${set.tree.maxLevel}${drawn < set.size ? `; first ${drawn} supports drawn` : ''}`;
  out.push(`<text class="caption" x="${left}" y="${H - 8}" font-size="11" fill="#444">${escapeXml(note)}</text>`);
  out.push('</svg>', '');
  return out.join('\n');
}

function barChart(out: string[], f: PlotFrame, counts: number[], xLabel: string, color: string): void {
  const bw = Math.max(1, (f.width / Math.max(1, counts.length)) * 0.8);
  out.push(`<g class="bars" fill="${color}">`);
  counts.forEach((n, l) => {
    if (n === 0) return;
    const x = frameX(f, l) - bw / 2, y = frameY(f, n);
    out.push(`<rect x="${f2(x)}" y="${f2(y)}" width="${f2(bw)}" height="${f2(f.top + f.height - y)}"><title>${l}: ${n}</title></rect>`);
  });
  out.push('</g>');
  const L = counts.length - 1;
  const stride = Math.max(1, Math.ceil((L + 1) / 12));
  const xTicks = Array.from({ length: Math.floor(L / stride) + 1 }, (_, i) => i * stride);
  out.push(axesSvg(f, xLabel, 'unknowns', { xTicks, xTickLabel: (v) => String(v) }));
}

function levels2d(domain: SpatialDomain, set: DoubleTree, T: number, opts: IndexSetSvgOptions): string {
  const gen = domain.forest.vGen;
  const byTime: number[] = [];
  const bySpace: number[] = [];
  for (let i = 0; i < set.tree.size; i++) {
    const l = set.tree.level[i]!;
    const fib = set.fibre(i);
    byTime[l] = (byTime[l] ?? 0) + fib.length;
    for (let p = 0; p < fib.length; p++) {
      const g = gen[fib[p]!]!;
      bySpace[g] = (bySpace[g] ?? 0) + 1;
    }
  }
  const fill = (a: number[]) => Array.from({ length: a.length }, (_, i) => a[i] ?? 0);
  const tCounts = fill(byTime), sCounts = fill(bySpace);
  const W = opts.width ?? 900;
  const times = opts.times ?? [T / 1000, T / 10, T];
  const chartW = (W - 3 * 70) / 2, chartH = 200;
  const meshW = (W - 70 - times.length * 70) / times.length;
  // Mesh panels keep the domain's aspect ratio.
  const c0 = domain.forest.vCoord;
  let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity;
  for (let v = 0; v < domain.initialVertexCount; v++) {
    x0 = Math.min(x0, c0[2 * v]!); x1 = Math.max(x1, c0[2 * v]!);
    y0 = Math.min(y0, c0[2 * v + 1]!); y1 = Math.max(y1, c0[2 * v + 1]!);
  }
  const meshH = Math.min(1.5 * meshW, (meshW * (y1 - y0)) / (x1 - x0));
  const H = Math.round(40 + chartH + 70 + 30 + meshH + 60);
  const out = open(W, H, opts.title);
  const maxT = Math.max(1, ...tCounts), maxS = Math.max(1, ...sCounts);
  out.push('<g class="panel temporal-levels">');
  out.push(`<text class="panel-title" x="${70 + chartW / 2}" y="${50}" text-anchor="middle">unknowns per temporal level</text>`);
  barChart(out, { left: 70, top: 60, width: chartW, height: chartH - 20, x0: -0.6, x1: tCounts.length - 0.4, y0: 0, y1: maxT * 1.05 }, tCounts, 'temporal level', '#1f4e99');
  out.push('</g><g class="panel spatial-levels">');
  const l2 = 70 * 2 + chartW;
  out.push(`<text class="panel-title" x="${l2 + chartW / 2}" y="${50}" text-anchor="middle">unknowns per spatial generation</text>`);
  barChart(out, { left: l2, top: 60, width: chartW, height: chartH - 20, x0: -0.6, x1: sCounts.length - 0.4, y0: 0, y1: maxS * 1.05 }, sCounts, 'spatial generation', '#2a8c5a');
  out.push('</g>');
  const s = new Float64Array(2);
  const meshTop = 40 + chartH + 70 + 30;
  times.forEach((t, k) => {
    if (!(t >= 0 && t <= T)) throw new InvalidArgumentError(`times[${k}] = ${t} is outside [0, ${T}]`, { field: `times[${k}]`, received: t });
    const fibres: Int32Array[] = [];
    for (let i = 0; i < set.tree.size; i++) {
      const [a, b] = temporalSupport(set, i, T, s);
      if (a <= t && t <= b && set.fibre(i).length > 0) fibres.push(set.fibre(i));
    }
    const union = unionSorted(fibres.length > 0 ? fibres : [domain.initialFreeVertices()]);
    const mesh = domain.leafMesh(domain.close(union));
    const left = 70 + k * (meshW + 70);
    const fr: PlotFrame = { left, top: meshTop, width: meshW, height: meshH, x0, x1, y0, y1 };
    out.push(`<g class="panel mesh-at-time">`);
    out.push(`<text class="panel-title" x="${f2(left + meshW / 2)}" y="${meshTop - 10}" text-anchor="middle">${escapeXml(`mesh at t = ${Number(((opts.start ?? 0) + t).toPrecision(4))} (${mesh.elementCount} triangles)`)}</text>`);
    out.push('<g class="mesh" fill="none" stroke="#333" stroke-width="0.4" stroke-linejoin="round">');
    const c = mesh.coords;
    for (let e = 0; e < mesh.elementCount; e++) {
      const p = [0, 1, 2].map((j) => mesh.elements[3 * e + j]!);
      out.push(`<polygon points="${p.map((i) => `${f2(frameX(fr, c[2 * i]!))},${f2(frameY(fr, c[2 * i + 1]!))}`).join(' ')}"/>`);
    }
    out.push('</g>');
    out.push(axesSvg(fr, 'x', 'y'));
    out.push('</g>');
  });
  out.push('</svg>', '');
  return out.join('\n');
}
