/**
 * Caps that keep a hostile or broken model file from exhausting memory or time. They are far above
 * any real rig model (tens of states and parameters) and each is reported with a clear message.
 */
export const LIMITS = {
  /** Bytes of the model file. */
  fileBytes: 1024 * 1024,
  /** YAML nodes in the whole file (every scalar, list and map). */
  yamlNodes: 200_000,
  /** YAML aliases (`*name`) in the file: each may repeat a large part when followed. */
  aliases: 50,
  states: 500,
  inputs: 200,
  parameters: 2000,
  defines: 2000,
  outputs: 500,
  experiments: 1000,
  /** Characters of one expression. */
  expressionChars: 4000,
  /** Parenthesis nesting in one expression (the parser is recursive). */
  parenDepth: 40,
  /** Depth of an expression's tree (code generation and unit inference walk it recursively). */
  treeDepth: 250,
  /** Characters of a name (state, parameter, experiment...). */
  nameChars: 64,
  /** Characters of a unit string. */
  unitChars: 100,
  /** Characters of free text (description) and of strings such as file and column names. */
  textChars: 20_000,
  stringChars: 1000,
  /** Problems listed in one error (a broken file can have thousands; the first ones suffice). */
  problemsShown: 200,
} as const;
