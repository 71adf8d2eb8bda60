/**
 * ndarray, imported through this one file. The package is CommonJS without a
 * `sideEffects: false` flag, so a bundler keeps it whenever a file that imports
 * it is kept. The build emits this file separately (tsup.config.ts), which lets
 * a bundler drop it — and the package — from bundles that never sample a grid.
 */
export { default as ndarray } from 'ndarray';
