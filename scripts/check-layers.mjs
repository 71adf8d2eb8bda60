#!/usr/bin/env node
/**
 * Fails on an import that runs up the layers of src/ (DEVELOPERS.md, "Layout"):
 *
 *   0  errors.ts, validation/, numerics/, vendor/, types/   shared by everything
 *   1  time/, space/                              independent of each other
 *   2  spacetime/
 *   3  system/
 *   4  output/
 *   5  adapt/
 *   6  front ends: solve.ts, cli/, estimation/, problem-file/ (and any other new top-level folder),
 *      and index.ts, the public entry point (front ends such as the CLI may use it)
 *
 * A file may import files of its own layer and of lower layers only; time/ and space/ may not
 * import each other. Imports of packages (no leading '.') are not checked. Type-only imports
 * count too: they couple the modules just the same.
 *
 * Usage: node scripts/check-layers.mjs   (prints each violation as file:line → target)
 */
import { existsSync, readFileSync, readdirSync } from 'node:fs';
import { dirname, join, relative, resolve, sep } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const src = join(root, 'src');

const LAYERS = {
  'errors.ts': 0, validation: 0, numerics: 0, vendor: 0, types: 0,
  time: 1, space: 1,
  spacetime: 2,
  system: 3,
  output: 4,
  adapt: 5,
  'solve.ts': 6, cli: 6, estimation: 6, 'problem-file': 6, 'index.ts': 6,
};
const FRONT_END = 6;

/** The top-level part of src/ a file belongs to ('time', 'solve.ts', …). */
function partOf(file) {
  return relative(src, file).split(sep)[0];
}
function layerOf(part) {
  return LAYERS[part] ?? FRONT_END;
}

function sources(dir) {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) =>
    e.isDirectory() ? sources(join(dir, e.name)) : /\.(m|c)?tsx?$/.test(e.name) ? [join(dir, e.name)] : []);
}

const IMPORT = /(?:^|\n)\s*(?:import|export)\s[^;]*?\sfrom\s+['"](\.[^'"]+)['"]|import\(\s*['"](\.[^'"]+)['"]\s*\)/g;

/** Known upward imports still to be removed, as 'file → target' (each is reported, not failed). */
const KNOWN = new Set([]);

const violations = [];
const known = [];
let checked = 0;
for (const file of sources(src)) {
  const text = readFileSync(file, 'utf8');
  const from = partOf(file);
  let m;
  while ((m = IMPORT.exec(text))) {
    const spec = m[1] ?? m[2];
    const target = resolve(dirname(file), spec);
    if (!target.startsWith(src + sep)) continue;
    checked++;
    // './errors' is the file errors.ts; './space/index' a file inside the folder space/.
    const toPart = partOf(existsSync(`${target}.ts`) ? `${target}.ts` : target);
    const line = text.slice(0, m.index + m[0].indexOf(spec)).split('\n').length;
    const up = layerOf(toPart) > layerOf(from);
    const sideways = from !== toPart && layerOf(from) === 1 && layerOf(toPart) === 1;
    if ((up || sideways) && KNOWN.has(`${relative(root, file)} → ${spec}`)) {
      known.push(`${relative(root, file)}:${line} imports '${spec}' (known, to be fixed)`);
    } else if (up || sideways) {
      violations.push(`${relative(root, file)}:${line} imports '${spec}' (${from} → ${toPart.replace(/\.ts$/, '')}: ${up ? 'upward' : 'time/space must stay independent'})`);
    }
  }
}

for (const k of known) console.log(`layering: ${k}`);
if (violations.length > 0) {
  console.log(`layering: ${violations.length} import(s) against the layer order`);
  for (const v of violations) console.log(`  ${v}`);
  console.log('order: errors/validation/numerics/vendor → time | space → spacetime → system → output → adapt → front ends and index');
  process.exit(1);
}
console.log(`layering: ${checked} relative imports, none upward`);
