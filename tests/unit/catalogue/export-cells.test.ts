import { describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import fc from 'fast-check';
import { safeCell } from '@/lib/catalogue/export';

// OWASP "CSV Injection": a cell a spreadsheet reads as a formula starts with = + - @, a tab or a
// carriage return; some programs trim leading spaces first, so those count too.
const FORMULA = /^\s*[=+\-@\t\r]/;

function parsedCells(line: string): string[] {
  // papaparse, a general-purpose CSV parser, reads the row the way a spreadsheet import would
  return (Papa.parse<string[]>(line, { delimiter: ',' }).data[0] ?? []) as string[];
}

describe('export cells cannot start a formula', () => {
  it.each([
    '=HYPERLINK("http://example.invalid","click")',
    '+1+2',
    '-2+3',
    '@SUM(A1:A2)',
    '\t=1+1',
    '\r=1+1',
    '   =cmd|" /C calc"!A0',
    'Label, =1+1',
    'plain "quoted" text',
  ])('%j', (text) => {
    const line = `# label,${safeCell(text)}`;
    const cells = parsedCells(line);
    expect(cells.length).toBe(2);
    expect(cells[1]).not.toMatch(FORMULA);
    // the text survives, behind an apostrophe when it had to be neutralised
    expect(cells[1].replace(/^'/, '')).toBe(text.replace(/\r\n|\r|\n/g, ' '));
  });

  it('holds for any text', () => {
    fc.assert(
      fc.property(fc.string({ maxLength: 40 }), (text) => {
        const cells = parsedCells(`# notes,${safeCell(text)}`);
        return cells.length === 2 && !FORMULA.test(cells[1]);
      }),
      { numRuns: 500 },
    );
  });
});
