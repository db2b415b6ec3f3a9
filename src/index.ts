/** The rigcal library: the same powers as the CLI, without printing or exiting. */
export * from './errors.js';
export * from './version.js';
export type * from './model/types.js';
export type * from './model/compiled-types.js';
export type * from './data/types.js';
export type * from './simulation/types.js';
export type * from './estimation/fit-result.js';
