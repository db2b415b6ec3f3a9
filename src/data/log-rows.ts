/**
 * The rows of an experiment's log, one at a time as the CSV reader hands them over: field count,
 * time (rows outside the window are skipped), inputs (never missing) and outputs (missing counted),
 * each converted into the model's unit as it is read.
 */
import { UserError } from '../errors.js';
import type { ExperimentSpec } from '../model/types.js';
import { shownText } from '../util/printable.js';
import type { LogPlan } from './column-plan.js';
import { GrowableF64, GrowableI32 } from './growable.js';
import type { HeaderLayout } from './log-header.js';
import { badCellHint, readCell } from './numbers.js';
import { LARGEST_SQUARABLE } from '../util/squares.js';

export class RowCollector {
  readonly time = new GrowableF64();
  readonly lines = new GrowableI32();
  readonly inputs: GrowableF64[];
  readonly outputs: GrowableF64[];
  readonly missing: number[];
  /** Earliest and latest time in the file, windowed out or not (for the empty-window message). */
  firstRowTime = Infinity;
  lastRowTime = -Infinity;
  private rowNumber = 0;

  constructor(
    private readonly plan: LogPlan,
    private readonly exp: ExperimentSpec,
    private readonly shown: string,
  ) {
    this.inputs = plan.inputs.map(() => new GrowableF64());
    this.outputs = plan.outputs.map(() => new GrowableF64());
    this.missing = plan.outputs.map(() => 0);
  }

  row(cells: string[], line: number, header: HeaderLayout): void {
    this.rowNumber++;
    const n = header.fields;
    if (cells.length !== n && (cells.length < n || cells.slice(n).some((c) => c !== ''))) {
      throw new UserError({ where: { file: this.shown, line }, what: `this row has ${cells.length} fields, the header (line ${header.line}) has ${n}`, fix: 'every row needs one value per header column (an empty field for a missing output sample)' });
    }
    const t = this.rowTime(cells, line, header);
    if (t === undefined) return;
    this.time.push(t);
    this.lines.push(line);
    const { inputs, outputs } = this.plan;
    // Plain loops: this runs once per cell of logs of a million rows.
    for (let j = 0; j < inputs.length; j++) {
      const p = inputs[j];
      const text = cells[p.index];
      const c = readCell(text);
      if (c === null) throw this.badCell(line, p.column, text, `input ${p.name}:`);
      if (Number.isNaN(c)) throw new UserError({ where: { file: this.shown, line }, what: `input column "${p.column}" (input ${p.name}) has a missing value ("${shownText(text)}")`, fix: 'inputs drive the simulation and cannot be missing: fill the gap in the log or window it out' });
      this.inputs[j].push(this.squarable(p.convert(c), line, p.column, text, `input ${p.name}`));
    }
    for (let j = 0; j < outputs.length; j++) {
      const p = outputs[j];
      if (p.index < 0) continue;
      const text = cells[p.index];
      const c = readCell(text);
      if (c === null) throw this.badCell(line, p.column, text, `output ${p.name}:`);
      if (Number.isNaN(c)) {
        this.missing[j]++;
        this.outputs[j].push(NaN);
      } else this.outputs[j].push(this.squarable(p.convert(c), line, p.column, text, `output ${p.name}`));
    }
  }

  /** The row's time in the log's unit, undefined when the window leaves the row out; a static log without time counts rows. */
  private rowTime(cells: string[], line: number, header: HeaderLayout): number | undefined {
    if (header.timeIndex < 0) return this.rowNumber - 1;
    const text = cells[header.timeIndex];
    const t = readCell(text);
    if (t === null) throw this.badCell(line, header.timeColumn, text, 'time');
    if (Number.isNaN(t)) throw new UserError({ where: { file: this.shown, line }, what: `the time column "${header.timeColumn}" is empty or NaN`, fix: 'every row needs a time; remove rows without one' });
    if (t < this.firstRowTime) this.firstRowTime = t;
    if (t > this.lastRowTime) this.lastRowTime = t;
    const win = this.exp.window;
    return win && (t < win[0] || t > win[1]) ? undefined : t;
  }

  /** `value` (in the model's unit) when its square is finite: a fit and a simulation square them. */
  private squarable(value: number, line: number, column: string, text: string, role: string): number {
    if (Math.abs(value) <= LARGEST_SQUARABLE) return value;
    throw new UserError({
      where: { file: this.shown, line },
      what: `${role}: column "${shownText(column)}" has ${shownText(text)}, whose square overflows (values up to ${LARGEST_SQUARABLE.toPrecision(2)} in the model's unit can be used)`,
      fix: 'check the value; if such magnitudes are real, declare a larger unit for the column (column_unit) and the model',
    });
  }

  private badCell(line: number, column: string, text: string, role: string): UserError {
    return new UserError({
      where: { file: this.shown, line },
      what: `${role} column "${shownText(column)}" has "${shownText(text)}", which is not a number`,
      fix: badCellHint(text),
    });
  }
}
