import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { MAX_COLUMNS, MAX_LINES, MAX_NUMBER_CHARS, readCurveText, scanNumber } from '@/lib/engine/reader';
import { CurveReadError, EngineInputError } from '@/lib/engine/errors';
import { readerOptionsSchema } from '@/lib/schemas/model';
import { refusal } from '../../support/reader';

// Hostile input is normal input: each limit of the reader, and its answers on
// long fields, many columns and long digit runs. The oracle for numbers is
// JavaScript's own Number() (ECMA-262 StringToNumber), a general-purpose parser.


const ROWS = ['650,0.1', '652,0.5', '654,0.9', '656,0.5', '658,0.1'];

describe('limits, each with a 422 naming the line', () => {
  it(`a row of more than ${MAX_COLUMNS} columns`, () => {
    const wide = (n: number, w: number) => [w, 0.5, ...Array.from({ length: n - 2 }, (_, i) => i)].join(',');
    const ok = readCurveText(['wl,t', ...[650, 652, 654, 656, 658].map((w) => wide(MAX_COLUMNS, w))].join('\n'));
    expect(ok.assumed.columns).toHaveLength(MAX_COLUMNS);
    const e = refusal(['# scan', 'wl,t', ...[650, 652, 654, 656, 658].map((w) => wide(MAX_COLUMNS + 1, w))].join('\n'));
    expect(e.status).toBe(422);
    expect(e.details[0].line).toBe(3);
    expect(e.message).toMatch(/Line 3: the row has more than 64 columns/);
  });

  it('one over-wide row among good ones', () => {
    const rows = [...ROWS];
    rows[2] = `654,0.9,${Array.from({ length: 100 }, () => '1').join(',')}`;
    // the modal width is 2, so the wide row is the one refused
    const e = refusal(['wl,t', ...rows].join('\n'));
    expect(e.details.map((d) => d.line)).toEqual([4]);
    expect(e.details[0].message).toMatch(/more than 64 columns/);
  });

  it(`a number of more than ${MAX_NUMBER_CHARS} characters`, () => {
    const at64 = `0.${'5'.repeat(MAX_NUMBER_CHARS - 2)}`;
    expect(readCurveText(['wl,t', ...ROWS.slice(0, 2), `654,${at64}`, ...ROWS.slice(3)].join('\n')).points.transmission[2]).toBe(Number(at64));
    const e = refusal(['wl,t', ...ROWS.slice(0, 2), `654,${at64}5`, ...ROWS.slice(3)].join('\n'));
    expect(e.status).toBe(422);
    expect(e.details[0]).toEqual({ line: 4, message: 'a value of 65 characters is longer than the 64 a number may have' });
  });

  it('a long digit run with a decimal comma is refused on its line, not searched for a pattern', () => {
    // the pattern this scan replaced took seconds on 80 kB of digits followed by a letter
    const e = refusal(`wl;t\n650;0,1\n652;${'1'.repeat(200_000)}x\n654;0,9\n656;0,5\n658;0,1\n660;0,1\n`);
    expect(e.details[0].line).toBe(3);
    expect(e.details[0].message).toMatch(/200,001 characters is longer than the 64/);
  });

  it('a long digit run alone, with no data, is named as such', () => {
    const e = refusal(`# a\n${'7'.repeat(100_000)}\n`);
    expect(e.details[0]).toMatchObject({ line: 2, message: expect.stringMatching(/100,000 characters/) });
  });

  it(`column options above ${MAX_COLUMNS - 1} are refused by the reader and by the schema`, () => {
    expect(() => readCurveText(ROWS.join('\n'), { wavelengthColumn: MAX_COLUMNS })).toThrow(EngineInputError);
    expect(readerOptionsSchema.safeParse({ transmissionColumn: MAX_COLUMNS }).success).toBe(false);
    expect(readerOptionsSchema.safeParse({ transmissionColumn: MAX_COLUMNS - 1 }).success).toBe(true);
  });

  it(`more than ${MAX_LINES.toLocaleString('en-US')} lines (413)`, () => {
    const e = refusal(`${ROWS.join('\n')}\n${'\n'.repeat(MAX_LINES)}`);
    expect(e.status).toBe(413);
    expect(e.details[0].line).toBe(MAX_LINES + 1);
  });
});

/** A decimal as people write it: sign, digits, a mark, digits, an exponent. */
const decimal = fc
  .record({
    sign: fc.constantFrom('', '+', '-'),
    int: fc.string({ unit: fc.constantFrom(...'0123456789'), maxLength: 30 }),
    frac: fc.option(fc.string({ unit: fc.constantFrom(...'0123456789'), maxLength: 30 }), { nil: undefined }),
    exp: fc.option(fc.tuple(fc.constantFrom('e', 'E'), fc.constantFrom('', '+', '-'), fc.integer({ min: 0, max: 400 })), { nil: undefined }),
  })
  .filter((d) => d.int.length + (d.frac?.length ?? 0) > 0)
  .map((d) => `${d.sign}${d.int}${d.frac !== undefined ? `.${d.frac}` : ''}${d.exp ? `${d.exp[0]}${d.exp[1]}${d.exp[2]}` : ''}`);

describe('number scanning (fast-check, against Number())', () => {
  it('reads a generated decimal, with either mark and spaces around, as Number() does, or refuses it when too long', () => {
    fc.assert(
      fc.property(decimal, fc.constantFrom('.', ','), fc.constantFrom('', ' ', '\t', '  '), (d, mark, pad) => {
        const written = `${pad}${mark === ',' ? d.replace('.', ',') : d}${pad}`;
        const got = scanNumber(written, mark as '.' | ',');
        if (d.length > MAX_NUMBER_CHARS) expect(got).toBeNaN();
        else expect(got).toBe(Number(d));
      }),
      { numRuns: 2000 },
    );
  });

  it('on any text, gives NaN or exactly what Number() gives', () => {
    fc.assert(
      fc.property(fc.string({ unit: fc.constantFrom(...'0123456789+-.,eExX In a'), maxLength: 80 }), (s) => {
        const got = scanNumber(s);
        if (!Number.isNaN(got)) expect(got).toBe(Number(s));
      }),
      { numRuns: 3000 },
    );
  });

  it('refuses forms Number() takes but a data file should not hold', () => {
    for (const s of ['', ' ', '0x1F', 'Infinity', '-Infinity', '1_000', '.', '+', '1e', '1e+', ',5', '5,']) expect(scanNumber(s)).toBeNaN();
    expect(scanNumber(',5', ',')).toBe(0.5);
    expect(scanNumber('5,', ',')).toBe(5);
  });
});

describe('files (fast-check): the reader answers right on random widths, separators and long fields', () => {
  const layout = fc.constantFrom(
    { sep: ',', mark: '.' },
    { sep: ';', mark: '.' },
    { sep: '\t', mark: '.' },
    { sep: ' ', mark: '.' },
    { sep: ';', mark: ',' },
    { sep: '\t', mark: ',' },
  );
  const file = fc.record({
    layout,
    ncols: fc.integer({ min: 2, max: MAX_COLUMNS + 20 }),
    rows: fc.integer({ min: 5, max: 30 }),
    t: fc.array(fc.integer({ min: 0, max: 10_000 }), { minLength: 30, maxLength: 30 }),
    header: fc.boolean(),
  });

  function build(f: { layout: { sep: string; mark: string }; ncols: number; rows: number; t: number[]; header: boolean }) {
    const { sep, mark } = f.layout;
    const w = (n: string) => (mark === ',' ? n.replace('.', ',') : n);
    const lines: string[] = [];
    if (f.header) lines.push(['wavelength', 'transmission', ...Array.from({ length: f.ncols - 2 }, (_, i) => `x${i}`)].join(sep));
    const expected: { wl: number; t: number }[] = [];
    for (let r = 0; r < f.rows; r++) {
      const wl = (500 + r * 1.25).toFixed(2);
      const t = (f.t[r] / 10_000).toFixed(4);
      expected.push({ wl: Number(wl), t: Number(t) });
      lines.push([w(wl), w(t), ...Array.from({ length: f.ncols - 2 }, (_, i) => w(`${i}.5`))].join(sep));
    }
    return { lines, expected, firstData: f.header ? 2 : 1 };
  }

  it('reads every column count up to the cap, refuses wider files on their first data line', () => {
    fc.assert(
      fc.property(file, (f) => {
        const { lines, expected, firstData } = build(f);
        const text = lines.join('\n');
        if (f.ncols > MAX_COLUMNS) {
          const e = refusal(text);
          expect(e.status).toBe(422);
          expect(e.details[0].line).toBe(firstData);
          expect(e.details[0].message).toMatch(/more than 64 columns/);
          return;
        }
        const r = readCurveText(text, { wavelengthColumn: 0, transmissionColumn: 1 });
        expect(r.assumed.columns).toHaveLength(f.ncols);
        expect(r.assumed.decimalSeparator).toBe(f.layout.mark);
        expect(r.points.wavelengthNm).toEqual(expected.map((e) => e.wl));
        expect(r.points.transmission).toEqual(expected.map((e) => e.t));
      }),
      { numRuns: 150 },
    );
  });

  it('refuses a row holding a long digit run or long junk, naming that row', () => {
    fc.assert(
      fc.property(
        file.filter((f) => f.ncols <= MAX_COLUMNS),
        fc.nat(),
        fc.nat(),
        fc.oneof(
          fc.integer({ min: MAX_NUMBER_CHARS + 1, max: 20_000 }).map((n) => '9'.repeat(n)),
          fc.integer({ min: MAX_NUMBER_CHARS + 1, max: 20_000 }).map((n) => `1${'0'.repeat(n)}x`),
          fc.string({ unit: fc.constantFrom(...'abc#"é'), minLength: 1, maxLength: 200 }).map((s) => `z${s}`),
        ),
        (f, rowPick, colPick, bad) => {
          const { lines, firstData } = build(f);
          const row = 1 + (rowPick % (f.rows - 2)); // neither the first nor the last data row
          const col = colPick % 2;
          const fields = lines[firstData - 1 + row].split(f.layout.sep);
          fields[col] = bad;
          lines[firstData - 1 + row] = fields.join(f.layout.sep);
          const e = refusal(lines.join('\n'), { wavelengthColumn: 0, transmissionColumn: 1 });
          expect(e.status).toBe(422);
          expect(e.details[0].line).toBe(firstData + row);
          expect(e.message).toMatch(new RegExp(`^Line ${firstData + row}:`));
          if (bad.length > MAX_NUMBER_CHARS && !bad.startsWith('z')) expect(e.details[0].message).toMatch(/characters is longer than the 64/);
        },
      ),
      { numRuns: 150 },
    );
  });
});
