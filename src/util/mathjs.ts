/**
 * The one place rigcal loads mathjs. We load its single-file bundle (an entry the package exports,
 * `mathjs/lib/browser/math.js`) rather than its ES modules: the same library and version, but it
 * loads in about 70 ms where the thousand ES modules take about 1 s, which every command paid at
 * start-up (measured on the 2-core machine of this project). Types come from the package as usual.
 */
import { createRequire } from 'node:module';
import type * as MathJsModule from 'mathjs';

const require = createRequire(import.meta.url);

/** The mathjs library object (what `import * as mathjs from 'mathjs'` gives). */
export const mathjs = require('mathjs/lib/browser/math.js') as typeof MathJsModule;

export const { all, create, parse, derivative, ConstantNode, FunctionNode, OperatorNode, SymbolNode } = mathjs;
