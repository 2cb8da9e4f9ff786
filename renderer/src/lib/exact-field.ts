/**
 * A text field over one stored SI value. The field remembers the text it was shown as; while the
 * text is unchanged it stands for the stored value exactly (no round trip through the rounded display
 * text), so saving an untouched field stores the same number. A unit switch re-renders the field in
 * the new unit and keeps the exact value: the stored one if untouched, the typed one if edited.
 */

export interface ExactField {
  /** What the input shows and the user edits. */
  text: string;
  /** The text it was last rendered as from `value`. */
  shown: string;
  /** The SI value `shown` stands for; null for an empty field (an optional value left out). */
  value: number | null;
}

/** The field for a stored value (null or undefined: an empty field). */
export function fieldOf(value: number | null | undefined, format: (si: number) => string): ExactField {
  const text = value === null || value === undefined ? '' : format(value);
  return { text, shown: text, value: value ?? null };
}

/** True when the user changed the text since it was rendered. */
export function touched(field: ExactField): boolean {
  return field.text !== field.shown;
}

/**
 * The SI value the field holds: the stored value exactly while untouched, else `parse(text)` (which
 * throws with a message naming the field). Empty text reads as null only when `optional`.
 */
export function readField(field: ExactField, parse: (text: string) => number, optional = false): number | null {
  if (!touched(field)) return field.value;
  if (optional && !field.text.trim()) return null;
  return parse(field.text);
}

/**
 * The field rendered with another formatter (a unit switch). Text that does not parse is left as
 * typed (it names its own unit or shows its error). Exact: the value kept is the stored or typed one,
 * never the rounded text.
 */
export function reshow(field: ExactField, format: (si: number) => string, parse: (text: string) => number): ExactField {
  let value: number | null;
  try {
    value = touched(field) ? (field.text.trim() ? parse(field.text) : null) : field.value;
  } catch {
    return field;
  }
  return fieldOf(value, format);
}

/**
 * SI value as editable text in `unit` with six significant digits and no trailing zeros:
 * 125e-6 m in mm -> "0.125 mm", in mil -> "4.92126 mil". Six digits keep a typed value's digits and
 * are finer than any manufacturing tolerance the inputs carry (common practice, no source).
 */
export function unitText(si: number, perUnit: number, unit: string): string {
  const scaled = Number((si / perUnit).toPrecision(6));
  return `${Object.is(scaled, -0) ? 0 : scaled} ${unit}`;
}

/** JSON with object keys sorted and undefined members left out: equal text = equal data. */
export function canonicalJson(value: unknown): string {
  return JSON.stringify(value, (_key, v: unknown) => {
    if (v && typeof v === 'object' && !Array.isArray(v)) {
      return Object.fromEntries(Object.entries(v as Record<string, unknown>).filter(([, x]) => x !== undefined).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)));
    }
    return v;
  });
}

/** True when two values hold the same data, whatever the order of their keys. */
export function sameData(a: unknown, b: unknown): boolean {
  return canonicalJson(a) === canonicalJson(b);
}
