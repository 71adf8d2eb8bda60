/**
 * Shared pieces of the SVG pictures: XML escaping, "nice" tick positions (1, 2, 5 × 10^k steps,
 * common practice in plotting), number formatting for tick labels, and axes with ticks.
 */

/** Escapes text for SVG/XML content and attribute values. */
export function escapeXml(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;');
}

/** About `count` tick values covering [lo, hi] at a step of 1, 2 or 5 × 10^k, inside [lo, hi]. */
export function niceTicks(lo: number, hi: number, count = 5): number[] {
  if (!(hi > lo) || !Number.isFinite(lo) || !Number.isFinite(hi)) return [lo];
  const raw = (hi - lo) / Math.max(1, count);
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((m) => m * mag).find((s) => s >= raw * 0.999) ?? 10 * mag;
  const out: number[] = [];
  const eps = step * 1e-9;
  for (let v = Math.ceil((lo - eps) / step) * step; v <= hi + eps; v += step) out.push(Math.abs(v) < eps ? 0 : v);
  return out;
}

/** A short label for a tick value (no float noise such as 0.30000000000000004). */
export function tickLabel(v: number, step: number): string {
  if (v === 0) return '0';
  const a = Math.abs(v);
  if (a >= 1e5 || a < 1e-3) return v.toExponential(Math.max(0, Math.min(6, Math.ceil(-Math.log10(step / a)))));
  const decimals = Math.max(0, Math.min(8, Math.ceil(-Math.log10(step) - 1e-9)));
  return v.toFixed(decimals);
}

/** Plot box in pixels and the data window it shows. */
export interface PlotFrame {
  left: number;
  top: number;
  width: number;
  height: number;
  x0: number;
  x1: number;
  y0: number;
  y1: number;
}

export function frameX(f: PlotFrame, x: number): number {
  return f.left + ((x - f.x0) / (f.x1 - f.x0)) * f.width;
}

export function frameY(f: PlotFrame, y: number): number {
  return f.top + f.height - ((y - f.y0) / (f.y1 - f.y0)) * f.height;
}

/** Axes (box, ticks, tick labels, axis labels) of a frame, as one `<g class="axes">`. */
export function axesSvg(f: PlotFrame, xLabel: string, yLabel: string, opts: { xTicks?: number[]; xTickLabel?: (v: number) => string } = {}): string {
  const out: string[] = ['<g class="axes" stroke="#222" fill="none" stroke-width="1">'];
  out.push(`<rect class="frame" x="${f.left}" y="${f.top}" width="${f.width}" height="${f.height.toFixed(2)}"/>`);
  const xt = opts.xTicks ?? niceTicks(f.x0, f.x1, Math.max(2, Math.round(f.width / 80)));
  const yt = niceTicks(f.y0, f.y1, Math.max(2, Math.round(f.height / 60)));
  const xs = xt.length > 1 ? xt[1]! - xt[0]! : 1;
  const ys = yt.length > 1 ? yt[1]! - yt[0]! : 1;
  const bottom = f.top + f.height;
  const labels: string[] = [];
  for (const v of xt) {
    const x = frameX(f, v).toFixed(2);
    out.push(`<line class="tick x-tick" x1="${x}" y1="${bottom}" x2="${x}" y2="${bottom + 5}"/>`);
    labels.push(`<text class="tick-label x-tick-label" x="${x}" y="${bottom + 18}" text-anchor="middle">${escapeXml(opts.xTickLabel ? opts.xTickLabel(v) : tickLabel(v, xs))}</text>`);
  }
  for (const v of yt) {
    const y = frameY(f, v).toFixed(2);
    out.push(`<line class="tick y-tick" x1="${f.left - 5}" y1="${y}" x2="${f.left}" y2="${y}"/>`);
    labels.push(`<text class="tick-label y-tick-label" x="${f.left - 8}" y="${(Number(y) + 4).toFixed(2)}" text-anchor="end">${escapeXml(tickLabel(v, ys))}</text>`);
  }
  out.push('</g>', '<g class="axis-labels" fill="#222">', ...labels);
  out.push(`<text class="axis-label x-label" x="${(f.left + f.width / 2).toFixed(2)}" y="${bottom + 36}" text-anchor="middle">${escapeXml(xLabel)}</text>`);
  const yc = f.top + f.height / 2;
  out.push(`<text class="axis-label y-label" transform="translate(${f.left - 46} ${yc.toFixed(2)}) rotate(-90)" text-anchor="middle">${escapeXml(yLabel)}</text>`);
  out.push('</g>');
  return out.join('\n');
}
