/** What freeze changes in a model file, decided once and applied either to the source text or to the YAML Document. */
export interface FreezePlan {
  /** Parameters whose entry becomes `fixed: value`, with the comment lines to put above them. */
  params: { name: string; value: number; unit: string; comment: string[] }[];
  /** Per experiment: values to add to its `set`. */
  sets: { experiment: string; entries: [string, number][] }[];
  /** Experiments whose data path changes. */
  paths: { experiment: string; file: string }[];
  header: string[];
}
