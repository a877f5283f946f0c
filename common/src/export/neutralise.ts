// Spreadsheet formula injection (CWE-1236): a text cell that begins with = + - @, a tab or a
// carriage return can be run as a formula when a CSV or XLSX file is opened in a spreadsheet.
// OWASP's "CSV Injection" page recommends prefixing such cells with a single quote so they are
// read as text. Numbers are never passed through here: they are written as numbers, so a
// negative reading stays a number.

/** The first characters that make a spreadsheet treat a cell as a formula (OWASP CSV Injection). */
export const FORMULA_TRIGGERS: readonly string[] = ['=', '+', '-', '@', '\t', '\r'];

/** True when a text cell would be read as a formula. */
export function startsLikeFormula(text: string): boolean {
  return text.length > 0 && FORMULA_TRIGGERS.includes(text[0]);
}

/** The text to write into a text cell: prefixed with ' when it would otherwise be a formula. */
export function neutraliseText(text: string): string {
  return startsLikeFormula(text) ? `'${text}` : text;
}

/** A value of an export cell: numbers stay numbers, text is neutralised, nothing stays empty. */
export type ExportValue = number | string | boolean | null;

export function exportCell(value: ExportValue | undefined): ExportValue {
  if (value === undefined || value === null) return null;
  if (typeof value === 'number') return Number.isFinite(value) ? value : null;
  if (typeof value === 'boolean') return value;
  return neutraliseText(value);
}
