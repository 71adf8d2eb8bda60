/** Public exports of the space module (re-exported by src/index.ts). */
export {};
