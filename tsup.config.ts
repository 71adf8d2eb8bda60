import { basename } from 'node:path';
import { defineConfig, type Options } from 'tsup';

/**
 * Imports that stay separate files in dist/ instead of being bundled in:
 * - src/vendor/* (third-party packages without `sideEffects: false`, see those
 *   files): emitted as dist/vendor/NAME.js|.cjs, so a user's bundler can drop
 *   them with the rest of an unused part of chronomesh (tree shaking);
 * - the CLI's, the problem-file layer's and the file layer's (src/files, node-only) import of the
 *   public entry ('../index'): they run on
 *   dist/index.js instead of carrying a second copy of the library (one class identity for
 *   `instanceof`, and the core bundle never contains the expression parser);
 * - the CLI's (and its bench code's) import of the problem-file layer: dist/problem-file.js.
 */
function separateFiles(cliUsesIndex: boolean): NonNullable<Options['esbuildPlugins']>[number] {
  return {
    name: 'chronomesh-separate-files',
    setup(build) {
      // tsup runs esbuild with format 'esm' for both and converts to CommonJS afterwards;
      // the output extension tells the two builds apart.
      const ext = build.initialOptions.outExtension?.['.js'] === '.cjs' ? 'cjs' : 'js';
      build.onResolve({ filter: /^\.\.?\/(.*\/)?vendor\/[\w-]+$/ }, (args) => ({
        path: `./vendor/${basename(args.path)}.${ext}`,
        external: true,
      }));
      if (cliUsesIndex) {
        build.onResolve({ filter: /^\.\.\/index$/ }, (args) =>
          /\/src\/(cli|problem-file|files)\//.test(args.importer) ? { path: `./index.${ext}`, external: true } : undefined);
        build.onResolve({ filter: /^\.\.\/(src\/)?problem-file\/index$/ }, (args) =>
          /\/(src\/cli|bench)\//.test(args.importer) ? { path: `./problem-file.${ext}`, external: true } : undefined);
      }
    },
  };
}

const common: Options = {
  target: 'node20',
  splitting: false,
  treeshake: true,
  // Maps for stack traces into src/ file names and lines, without a copy of the sources
  // (sourcesContent), which made up most of the unpacked package.
  sourcemap: true,
  esbuildOptions(o) {
    o.sourcesContent = false;
  },
};

export default defineConfig([
  // The library and the problem-file layer (export path chronomesh/problem-file, on top of
  // dist/index.*): ESM + CommonJS + declarations (dist/ is emptied by the build script).
  {
    ...common,
    entry: { index: 'src/index.ts', 'problem-file': 'src/problem-file/index.ts', files: 'src/files/index.ts' },
    format: ['esm', 'cjs'],
    dts: { entry: { index: 'src/index.ts', 'problem-file': 'src/problem-file/index.ts', files: 'src/files/index.ts' } },
    esbuildPlugins: [separateFiles(true)],
  },
  // The vendored re-exports, one small file per package and format.
  {
    ...common,
    entry: { 'vendor/typed-function': 'src/vendor/typed-function.ts', 'vendor/ndarray': 'src/vendor/ndarray.ts' },
    format: ['esm', 'cjs'],
    sourcemap: false,
  },
  // The command line: ESM only, on top of dist/index.js and dist/problem-file.js.
  {
    ...common,
    entry: { cli: 'src/cli/main.ts' },
    format: ['esm'],
    esbuildPlugins: [separateFiles(true)],
  },
]);
