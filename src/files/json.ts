/**
 * The one JSON writer of rigcal's files and --json output: two-space indent and a final line break.
 * JSON has no NaN or infinities; JSON.stringify writes them as null (ECMA-262, SerializeJSONProperty),
 * which is what every reader of fit.json, validation.json and the --json outputs gets.
 */
export function toJson(value: unknown): string {
  return `${JSON.stringify(value, null, 2)}\n`;
}
