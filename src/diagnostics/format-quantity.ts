/** Numbers in sentences: three significant digits and the unit, e.g. "0.8 s", "12.5 ms". */
export function formatQuantity(value: number, unit: string | undefined): string {
  const text = Number.isFinite(value) ? String(Number(value.toPrecision(3))) : String(value);
  return unit ? `${text} ${unit}` : `${text} samples`;
}
