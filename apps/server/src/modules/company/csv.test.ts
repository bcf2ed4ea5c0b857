import { describe, expect, it } from 'vitest';
import { csvCell, csvLine } from './csv.ts';

describe('CSV cells', () => {
  it('quotes every cell and doubles quotes inside', () => {
    expect(csvCell('plain')).toBe('"plain"');
    expect(csvCell('say "hi", then go')).toBe('"say ""hi"", then go"');
    expect(csvCell('two\nlines')).toBe('"two\nlines"');
    expect(csvCell(null)).toBe('""');
    expect(csvCell(42)).toBe('"42"');
  });

  it.each(['=SUM(A1:A2)', '+1', '-2+3', '@cmd', '\tindent', '\rreturn'])('defuses a cell starting like a formula: %j', (value) => {
    expect(csvCell(value)).toBe(`"'${value}"`);
  });

  it('leaves a formula sign inside the text alone', () => {
    expect(csvCell('a=b')).toBe('"a=b"');
  });

  it('ends a line with CRLF', () => {
    expect(csvLine(['a', 'b'])).toBe('"a","b"\r\n');
  });
});
