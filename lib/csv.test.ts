import { describe, expect, it } from 'vitest';
import { csvCell, toCsv } from './csv';

describe('csvCell', () => {
  it.each([
    ['plain', 'plain'],
    ['a,b', '"a,b"'],
    ['say "hi"', '"say ""hi"""'],
    ['two\nlines', '"two\nlines"'],
    ['cr\rlf', '"cr\rlf"'],
    ['', ''],
  ])('quotes %j as RFC 4180 asks', (input, want) => {
    expect(csvCell(input)).toBe(want);
  });

  it.each([
    ['=SUM(A1:A2)', "'=SUM(A1:A2)"],
    ['+1', "'+1"],
    ['-2+3', "'-2+3"],
    ['@cmd', "'@cmd"],
    ['\tx', "'\tx"],
    ['=HYPERLINK("http://x","a,b")', `"'=HYPERLINK(""http://x"",""a,b"")"`],
  ])('keeps %j from being read as a formula', (input, want) => {
    expect(csvCell(input)).toBe(want);
  });

  it('writes numbers and missing values', () => {
    expect(csvCell(12)).toBe('12');
    expect(csvCell(null)).toBe('');
    expect(csvCell(undefined)).toBe('');
  });
});

describe('toCsv', () => {
  it('ends every record with CRLF, header first', () => {
    expect(toCsv(['a', 'b'], [['1', 'x,y']])).toBe('a,b\r\n1,"x,y"\r\n');
  });
});
