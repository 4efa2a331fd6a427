/**
 * One cell of every CSV the product exports (Utstein, restock lists, audit trail): RFC 4180
 * quoting, and never read as a formula by a spreadsheet (OWASP, "CSV Injection"). A cell that
 * starts with = + - @, a tab, a carriage return or a line feed (or their full-width forms, or
 * any of these after leading spaces) is prefixed with a single quote, so the spreadsheet shows
 * it as text. Only a plain number (`-12`, `3.5`, `1e-3`) keeps its leading minus: `-1+1` or
 * `-2+3+cmd|' /C calc'!A0` is not a number and is defused like any other formula.
 */
const FORMULA_START = /^[\s\u3000]*[=+\-@\uFF1D\uFF0B\uFF0D\uFF20]|^[\t\r\n]/;
const PLAIN_NUMBER = /^-?(?:\d+(?:\.\d+)?|\.\d+)(?:[eE][+-]?\d+)?$/;

export function csvCell(value: unknown): string {
  let text: string;
  if (value === null || value === undefined) text = '';
  else if (typeof value === 'number') text = Number.isFinite(value) ? String(value) : '';
  else if (typeof value === 'string') text = value;
  else if (typeof value === 'boolean') text = String(value);
  else text = JSON.stringify(value);
  if (FORMULA_START.test(text) && !PLAIN_NUMBER.test(text)) text = `'${text}`;
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/**
 * Reads an RFC 4180 file (as `csvCell` writes it) into rows of cells, header first. For the
 * receiving side and the tests: quotes are undone, the formula guard's apostrophe is kept.
 */
export function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let cell = '';
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (quoted) {
      if (c === '"' && text[i + 1] === '"') {
        cell += '"';
        i++;
      } else if (c === '"') quoted = false;
      else cell += c;
    } else if (c === '"') quoted = true;
    else if (c === ',') {
      row.push(cell);
      cell = '';
    } else if (c === '\r' && text[i + 1] === '\n') {
      row.push(cell);
      rows.push(row);
      row = [];
      cell = '';
      i++;
    } else cell += c;
  }
  if (cell !== '' || row.length > 0) rows.push([...row, cell]);
  return rows;
}

/** The rows of a parsed file as objects by column name. */
export function csvRecords(text: string): Record<string, string>[] {
  const [header = [], ...rows] = parseCsv(text);
  return rows.map((r) => Object.fromEntries(header.map((name, i) => [name, r[i] ?? ''])));
}
