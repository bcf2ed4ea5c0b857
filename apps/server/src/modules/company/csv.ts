/**
 * CSV as RFC 4180 writes it: every cell quoted, quotes doubled, CRLF line ends.
 *
 * A spreadsheet treats a cell starting with = + - @ (or a tab or carriage
 * return) as a formula, so text someone typed into Underfoot could run as one
 * when the office opens the export. Such cells get a leading single quote
 * (OWASP, "CSV Injection").
 */
const FORMULA_START = /^[=+\-@\t\r]/;

export function csvCell(value: unknown): string {
  let text = value === null || value === undefined ? '' : String(value);
  if (FORMULA_START.test(text)) text = `'${text}`;
  return `"${text.replace(/"/g, '""')}"`;
}

export function csvLine(cells: readonly unknown[]): string {
  return `${cells.map(csvCell).join(',')}\r\n`;
}
