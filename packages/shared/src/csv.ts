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
