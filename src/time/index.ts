/** Public exports of the time module (re-exported by src/index.ts). */
export {};
