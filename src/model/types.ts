/**
 * A loaded model: plain data, validated against the model format (shared spec model-format.md).
 * Simulation and estimation are functions of it; nothing here runs user text.
 *
 * Numbers are stored in the unit the model file declares for that symbol (no hidden conversion);
 * data columns are converted into these units when they are read.
 */
import type { MathNode } from 'mathjs';
import type { SourceLocation } from '../errors.js';

/** A checked expression: parsed by mathjs and accepted by the allowed-list check. */
export interface Expr {
  /** The text as written in the model file. */
  text: string;
  /** The checked tree (only allowed node types and functions). */
  node: MathNode;
  /** Where the text is in the model file. */
  where: SourceLocation;
}

export interface StateSpec {
  name: string;
  /** Unit string as written (e.g. `rad/s`), '' when none given. */
  unit: string;
  /** Initial value: an expression of parameters only (a number is an expression too). */
  initial: Expr;
  where: SourceLocation;
}

export type Interpolation = 'linear' | 'hold';

export interface InputSpec {
  name: string;
  unit: string;
  /** Column in the log; defaults to the input's name. */
  column: string;
  /** Unit of the logged column, converted into `unit`; undefined when the same. */
  columnUnit?: string;
  interpolate: Interpolation;
  /** Transport delay in model time units: a number, or the name of a parameter. */
  delay?: number | string;
  where: SourceLocation;
}

interface ParameterBase {
  name: string;
  unit: string;
  where: SourceLocation;
}
export interface FixedParameterSpec extends ParameterBase {
  kind: 'fixed';
  value: number;
}
export interface FreeParameterSpec extends ParameterBase {
  kind: 'free';
  min: number;
  max: number;
  /** First guess (defaulted per the spec when not given). */
  start: number;
  /** Coordinate the optimiser works in (defaulted per the spec when not given). */
  scale: 'log' | 'linear';
  perExperiment: boolean;
}
export type ParameterSpec = FixedParameterSpec | FreeParameterSpec;

export interface DefineSpec {
  name: string;
  expr: Expr;
}

export interface EquationSpec {
  /** The state this equation is the time derivative of. */
  state: string;
  expr: Expr;
}

export interface OutputSpec {
  name: string;
  expr: Expr;
  unit: string;
  column: string;
  columnUnit?: string;
  /** Measurement noise standard deviation in `unit`; undefined: estimated by the fit. */
  sigma?: number;
  where: SourceLocation;
}

export type ExperimentRole = 'fit' | 'validation';

export interface ExperimentSpec {
  name: string;
  /** Absolute path of the CSV file (resolved relative to the model file). */
  file: string;
  /** The path as written in the model file, for messages and provenance. */
  fileAsWritten: string;
  /** Time column; undefined means "t", else "time" (and static models need none). */
  time?: string;
  /** Unit of the time column; default `s`. */
  timeUnit: string;
  /** [from, to] in the time column's unit; rows outside are ignored. */
  window?: [number, number];
  /** Integration start in the time column's unit; default the first time in the window. */
  start?: number;
  role: ExperimentRole;
  /** Fixed parameters with a different value in this experiment (`set`), in the parameter's unit. */
  set: Record<string, number>;
  /** Initial values overriding the states' ones in this experiment. */
  initial: Record<string, Expr>;
  /** Column renames for this experiment: input/output name -> column name. */
  columns: Record<string, string>;
  where: SourceLocation;
}

export interface Model {
  /** Absolute path of the model file, and the path as given. */
  file: string;
  fileAsGiven: string;
  /** SHA-256 (hex) of the model file's bytes. */
  sha256: string;
  format: 1;
  name: string;
  description: string;
  timeUnit: string;
  /** True when there are no states: outputs are functions of inputs and parameters row by row. */
  isStatic: boolean;
  states: StateSpec[];
  inputs: InputSpec[];
  parameters: ParameterSpec[];
  /** In dependency order: each define uses only earlier defines. */
  defines: DefineSpec[];
  /** Aligned with `states`. */
  equations: EquationSpec[];
  outputs: OutputSpec[];
  experiments: ExperimentSpec[];
  units: 'check' | 'off';
  /**
   * What the dimensional check did: 'checked'; 'off' (units: off); 'no-units' (no symbol carries a
   * unit, so there was nothing to check). `check` prints it.
   */
  unitCheck?: 'checked' | 'off' | 'no-units';
  /** Values given with `--set` (already applied to `parameters`/`experiments`), for provenance. */
  overrides: Record<string, number>;
}
