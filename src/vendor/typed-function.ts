/**
 * typed-function, imported through this one file. The package has no
 * `sideEffects: false` flag (its module creates an instance when loaded), so a
 * bundler keeps it whenever a file that imports it is kept. The build emits this
 * file separately (tsup.config.ts), which lets a bundler drop it — and the
 * package — from bundles that never call solve().
 */
export { default as typed } from 'typed-function';
