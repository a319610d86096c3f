/**
 * CSV as RFC 4180 describes it: comma-separated, CRLF line ends, fields with a
 * comma, quote or line break enclosed in double quotes and inner quotes doubled.
 * Text that a spreadsheet would run as a formula (starting with = + - @, a tab or
 * a carriage return) gets a leading apostrophe, as the OWASP guidance on CSV
 * injection recommends. Numbers are written as they are.
 */
export type Cell = string | number | boolean | null | undefined;

export type Column<T> = { header: string; value: (row: T) => Cell };

const FORMULA_START = /^[=+\-@\t\r]/;

export function csvCell(value: Cell): string {
  if (value === null || value === undefined) return '';
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : '';
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  const text = FORMULA_START.test(value) ? `'${value}` : value;
  return /[",\r\n]/.test(text) || text !== text.trim() ? `"${text.replace(/"/g, '""')}"` : text;
}

export function toCsv<T>(rows: readonly T[], columns: readonly Column<T>[]): string {
  const lines = [columns.map((c) => csvCell(c.header)), ...rows.map((row) => columns.map((c) => csvCell(c.value(row))))];
  return lines.map((cells) => cells.join(',')).join('\r\n') + '\r\n';
}
