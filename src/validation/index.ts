/** Argument checks, option-key suggestions and the memory budget shared by every layer (internal). */
export * from './checks';
export { editDistance, nearestName } from './names';
export * from './budget';
