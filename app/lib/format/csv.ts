/*
 * CSV as RFC 4180 describes it: fields joined by commas, records by CRLF; a field holding a comma,
 * a double quote, CR or LF is wrapped in double quotes with inner quotes doubled.
 * Spreadsheets run a cell that starts with = + - @ (or a tab / CR that hides one) as a formula, so
 * such cells get a leading single quote (OWASP, "CSV Injection").
 */

const FORMULA_START = /^[=+\-@\t\r]/;
const NEEDS_QUOTES = /[",\r\n]/;

/** One CSV field: formula-guarded, then quoted when it must be. */
export function escapeCsvField(value: string | number | null | undefined): string {
  if (value === null || value === undefined) return "";
  let text = typeof value === "number" ? String(value) : value;
  // Numbers are written by us and are data, not formulas; only text from people is guarded.
  if (typeof value === "string" && FORMULA_START.test(text)) text = `'${text}`;
  return NEEDS_QUOTES.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** A whole CSV document (header first), CRLF line ends, with a trailing CRLF. */
export function toCsv(header: string[], rows: (string | number | null | undefined)[][]): string {
  return [header, ...rows].map((row) => row.map(escapeCsvField).join(",")).join("\r\n") + "\r\n";
}
