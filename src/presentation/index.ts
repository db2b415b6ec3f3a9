/** The presentation layer: numbers, tables, name suggestions and verdicts in words (pure functions). */
export * from './numbers.js';
export * from './text-table.js';
export * from './nearest-names.js';
export * from './verdicts.js';
export * from './printable.js';
