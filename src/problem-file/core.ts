/**
 * The core library as seen from the problem-file layer. Everything this layer needs from the
 * core comes through this one file, so the build can point it at the core bundle instead of
 * copying the core into the problem-file bundle (one class identity for `instanceof`).
 */
export * from '../index';
