/**
 * A described numeric setting: the threshold or weight a check reads, with the unit, the allowed
 * range an editor may choose from, and where the default comes from. Check thresholds and quality
 * weights are lists of these, so the rules page, the settings form and the stored versions all
 * read one description.
 */

export interface SettingDef {
  /** Stable dotted key, e.g. "range.scanSpeed.max". Stored in settings versions; never rename. */
  key: string;
  /** Group heading on the settings form. */
  group: string;
  label: string;
  /** Unit of the value ("" for a ratio or weight). */
  unit: string;
  defaultValue: number;
  /** Smallest and largest value an editor may save. */
  min: number;
  max: number;
  /** The publication, standard or "common practice" / "from memory" note the default rests on. */
  source: string;
}

/**
 * Checks a candidate set of values against the definitions: every key known, every value a finite
 * number inside its def's range. Returns messages keyed by setting key; empty when valid.
 *
 * @example
 * validateSettingValues([{ key: "a", group: "g", label: "A", unit: "", defaultValue: 1, min: 0, max: 2, source: "s" }], { a: 3 });
 * // { a: "A must be between 0 and 2; got 3." }
 */
export function validateSettingValues(defs: readonly SettingDef[], values: Readonly<Record<string, number>>): Record<string, string> {
  const errors: Record<string, string> = {};
  const known = new Set(defs.map((d) => d.key));
  for (const key of Object.keys(values)) if (!known.has(key)) errors[key] = `Unknown setting "${key}".`;
  for (const def of defs) {
    const value = values[def.key];
    if (value === undefined) continue;
    if (typeof value !== "number" || !Number.isFinite(value)) errors[def.key] = `${def.label} must be a number.`;
    else if (value < def.min || value > def.max) errors[def.key] = `${def.label} must be between ${def.min} and ${def.max}; got ${value}.`;
  }
  return errors;
}
