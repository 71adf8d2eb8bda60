import { basename } from 'node:path';
import { defineConfig, type Options } from 'tsup';

/**
 * Imports that stay separate files in dist/ instead of being bundled in:
 * - src/vendor/* (third-party packages without `sideEffects: false`, see those
 *   files): emitted as dist/vendor/NAME.js|.cjs, so a user's bundler can drop
 *   them with the rest of an unused part of chronomesh (tree shaking);
 * - the CLI's import of the public entry ('../index'): the CLI runs on
 *   dist/index.js instead of carrying a second copy of the library.
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
          args.importer.includes('/src/cli/') ? { path: `./index.${ext}`, external: true } : undefined);
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
  // The library: ESM + CommonJS + declarations (dist/ is emptied by the build script).
  {
    ...common,
    entry: { index: 'src/index.ts' },
    format: ['esm', 'cjs'],
    dts: { entry: { index: 'src/index.ts' } },
    esbuildPlugins: [separateFiles(false)],
  },
  // The vendored re-exports, one small file per package and format.
  {
    ...common,
    entry: { 'vendor/typed-function': 'src/vendor/typed-function.ts', 'vendor/ndarray': 'src/vendor/ndarray.ts' },
    format: ['esm', 'cjs'],
    sourcemap: false,
  },
  // The command-line demo: ESM only, on top of dist/index.js.
  {
    ...common,
    entry: { cli: 'src/cli/main.ts' },
    format: ['esm'],
    esbuildPlugins: [separateFiles(true)],
  },
]);
