/**
 * CSV text as RFC 4180 writes it: fields separated by commas, records by CRLF, a field quoted
 * when it holds a comma, a double quote, CR or LF, and a double quote inside doubled.
 *
 * Opened in a spreadsheet, a cell that starts with = + - @ (or a tab or carriage return) is read
 * as a formula, so text that people typed (a comment, a version name) could run one. Such a cell
 * is written with a leading apostrophe, which spreadsheets show as text (OWASP, "CSV Injection";
 * common practice). The apostrophe is visible to a program that reads the file; every cell of
 * ours that could start that way is free text, where it does no harm.
 */

const FORMULA_START = /^[=+\-@\t\r]/;
const NEEDS_QUOTES = /[",\r\n]/;

export function csvCell(value: string | number | null | undefined): string {
  let s = value === null || value === undefined ? '' : String(value);
  if (FORMULA_START.test(s)) s = `'${s}`;
  return NEEDS_QUOTES.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** The whole file: a header row and the records, every line ending in CRLF. */
export function toCsv(header: string[], rows: (string | number | null | undefined)[][]): string {
  return [header, ...rows].map((r) => r.map(csvCell).join(',') + '\r\n').join('');
}
