/**
 * The pictures in a real browser: headless Chromium (Debian's package; .ci/run installs it)
 * parses each SVG as XML (no parser error, escaped title intact) and takes a screenshot; the
 * screenshots must be non-blank and show the axes frame, a many-coloured field and the colour bar.
 * Skipped only outside CI when no Chromium is installed.
 */
import { execFile, execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { DoubleTree, HeatProblem, SpaceTimeSystem, indexSetToSvg, intervalDomain, lShapeDomain, sliceToSvg } from '../../src/index';
import { decodePng, type Image } from '../helpers/png';

function findChromium(): string | null {
  for (const name of ['chromium', 'chromium-browser', 'google-chrome']) {
    try {
      return execFileSync('sh', ['-c', `command -v ${name}`], { encoding: 'utf8' }).trim() || null;
    } catch { /* not found */ }
  }
  return null;
}
const chromium = findChromium();
const dir = mkdtempSync(join(tmpdir(), 'chronomesh-browser-'));

function browser(args: string[], profile: string): Promise<string> {
  return new Promise((done, fail) => {
    execFile(chromium!, ['--headless', '--no-sandbox', '--disable-gpu', '--hide-scrollbars', `--user-data-dir=${join(dir, profile)}`, ...args],
      { timeout: 120000, maxBuffer: 1 << 26 }, (err, stdout) => (err ? fail(err) : done(stdout)));
  });
}

function size(svg: string): [number, number] {
  const m = /<svg[^>]* width="(\d+)" height="(\d+)"/.exec(svg)!;
  return [Number(m[1]), Number(m[2])];
}

function pixel(img: Image, x: number, y: number): [number, number, number] {
  const i = 4 * (Math.round(y) * img.width + Math.round(x));
  return [img.data[i]!, img.data[i + 1]!, img.data[i + 2]!];
}
const isWhite = ([r, g, b]: [number, number, number]) => r > 245 && g > 245 && b > 245;
const isDark = ([r, g, b]: [number, number, number]) => r < 120 && g < 120 && b < 120;

/** Numbers of an element's attributes in the SVG text, e.g. the colour-bar ramp's x/y/width/height. */
function attrs(svg: string, cls: string): Record<string, number> {
  const m = new RegExp(`<[a-z]+ class="${cls}"([^>]*)>`).exec(svg)!;
  return Object.fromEntries([...m[1]!.matchAll(/(\w+)="([-\d.]+)"/g)].map((a) => [a[1]!, Number(a[2])]));
}

const shouldRun = chromium !== null || process.env.CI === 'true';
describe.runIf(shouldRun)('pictures in headless Chromium', () => {
  const dom = lShapeDomain(1);
  const { solution } = new SpaceTimeSystem(new HeatProblem({ domain: dom, T: 1, initial: () => 1 }), DoubleTree.sparseGrid(dom, 5)).solve();
  const d1 = intervalDomain(0, 1, 2);
  const set1 = DoubleTree.sparseGrid(d1, 6);
  const { solution: rod } = new SpaceTimeSystem(new HeatProblem({ domain: d1, T: 1, initial: () => 1 }), set1).solve();
  const pictures: Record<string, string> = {
    slice2d: sliceToSvg(solution.slice(0.02), { title: 'L & bracket <hot>', quantity: 'temperature' }),
    slice1d: sliceToSvg(rod.slice(0.02), { title: 'rod & "ends"' }),
    index1d: indexSetToSvg(d1, set1, 1, { logTime: true, title: 'index set' }),
    index2d: indexSetToSvg(dom, DoubleTree.sparseGrid(dom, 4), 1, { title: 'index set 2D' }),
  };
  const shots = (async () => {
    if (!chromium) throw new Error('CI without Chromium: .ci/run should install the chromium package');
    const out: Record<string, { img: Image; dom: string }> = {};
    await Promise.all(Object.entries(pictures).map(async ([name, svg]) => {
      const file = join(dir, `${name}.svg`);
      writeFileSync(file, svg);
      const [w, h] = size(svg);
      const png = join(dir, `${name}.png`);
      await browser([`--window-size=${w},${h}`, `--screenshot=${png}`, `file://${file}`], `${name}-shot`);
      const dom = await browser(['--dump-dom', `file://${file}`], `${name}-dom`);
      out[name] = { img: decodePng(readFileSync(png)), dom };
    }));
    return out;
  })();

  it('parses every SVG as XML with the escaped titles intact', async () => {
    const s = await shots;
    for (const [name, { dom }] of Object.entries(s)) {
      expect(dom, name).not.toMatch(/parsererror|This page contains the following errors/);
      expect(dom, name).toMatch(/<svg/);
    }
    expect(s.slice2d!.dom).toContain('L &amp; bracket &lt;hot&gt;');
  }, 300000);

  it('screenshots are non-blank: a substantial, many-coloured field in the 2D slice', async () => {
    const s = await shots;
    for (const [name, { img }] of Object.entries(s)) {
      let ink = 0;
      for (let y = 0; y < img.height; y += 2) for (let x = 0; x < img.width; x += 2) if (!isWhite(pixel(img, x, y))) ink++;
      expect(ink / ((img.width * img.height) / 4), name).toBeGreaterThan(0.02);
    }
    const img = s.slice2d!.img;
    const colours = new Set<string>();
    for (let y = 0; y < img.height; y += 3) for (let x = 0; x < img.width; x += 3) colours.add(pixel(img, x, y).join(','));
    expect(colours.size).toBeGreaterThan(200);
  }, 300000);

  it('the axes frame, the colour bar and the labels are where the SVG puts them', async () => {
    const s = await shots;
    const svg = pictures.slice2d!;
    const img = s.slice2d!.img;
    const frame = attrs(svg, 'frame');
    // The bottom edge of the axes frame is drawn along its length.
    const yb = frame.y! + frame.height!;
    let dark = 0;
    // (a 1-pixel line at a fractional position is anti-aliased over two rows: grey, not black)
    const frameInk = ([r, g, b]: [number, number, number]) => r < 190 && g < 190 && b < 190 && Math.abs(r - b) < 40;
    // Sampled along the right half, below the L's cut-out, where nothing but the frame is drawn.
    for (let k = 11; k < 20; k++) if ([-1, 0, 1].some((d) => frameInk(pixel(img, frame.x! + (k / 20) * frame.width!, yb + d)))) dark++;
    expect(dark).toBeGreaterThanOrEqual(8);
    expect(isWhite(pixel(img, frame.x! + 0.75 * frame.width!, yb - 10))).toBe(true); // and the cut-out is empty
    // The colour bar runs from the map's low end (dark violet) at the bottom to its high end (yellow) at the top.
    const bar = attrs(svg, 'colorbar-ramp');
    const cx = bar.x! + bar.width! / 2;
    const bottom = pixel(img, cx, bar.y! + bar.height! - 3), topc = pixel(img, cx, bar.y! + 3);
    expect(bottom[0]).toBeLessThan(110); expect(bottom[2]).toBeGreaterThan(60);   // ≈ #440154
    expect(topc[0]).toBeGreaterThan(200); expect(topc[1]).toBeGreaterThan(190); expect(topc[2]).toBeLessThan(100); // ≈ #fde725
    // Tick labels of the colour bar and the axis labels are rendered (dark text pixels right of the bar, below the frame).
    const textInk = (x0: number, y0: number, x1: number, y1: number) => {
      let n = 0;
      for (let y = y0; y < y1; y++) for (let x = x0; x < x1; x++) if (isDark(pixel(img, x, y))) n++;
      return n;
    };
    expect(textInk(bar.x! + bar.width! + 8, bar.y!, bar.x! + bar.width! + 50, bar.y! + bar.height!)).toBeGreaterThan(30);
    expect(textInk(frame.x!, yb + 8, frame.x! + frame.width!, yb + 40)).toBeGreaterThan(30);
    expect(textInk(0, 0, img.width, 30)).toBeGreaterThan(30); // title
  }, 300000);
});
