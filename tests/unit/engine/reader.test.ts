import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { MAX_FILE_BYTES, MAX_ROWS, readCurveText } from '@/lib/engine/reader';
import { CurveReadError } from '@/lib/engine/errors';
import { refusal } from '../../support/reader';

const W = [650, 652, 654, 656, 658];
const T = [0.1, 0.5, 0.9, 0.5, 0.1];


describe('layouts the reader accepts', () => {
  const cases: [string, string, Partial<Record<string, unknown>>][] = [
    ['CSV with a header', 'wavelength_nm,transmission\n650,0.1\n652,0.5\n654,0.9\n656,0.5\n658,0.1\n', { delimiter: ',', headerLines: 1, transmissionUnit: 'fraction' }],
    ['CSV without a header', '650,0.1\n652,0.5\n654,0.9\n656,0.5\n658,0.1', { delimiter: ',', headerLines: 0 }],
    ['TSV in percent with CRLF', 'Wavelength (nm)\tT (%)\r\n650\t10\r\n652\t50\r\n654\t90\r\n656\t50\r\n658\t10\r\n', { delimiter: '\t', transmissionUnit: 'percent' }],
    ['semicolons, decimal commas and a BOM', '\uFEFFLambda [nm];Transmission [%]\n650,0;10,0\n652,0;50,0\n654,0;90,0\n656,0;50,0\n658,0;10,0\n', { delimiter: ';', decimalSeparator: ',', transmissionUnit: 'percent' }],
    ['tab with decimal commas', '650,0\t0,1\n652,0\t0,5\n654,0\t0,9\n656,0\t0,5\n658,0\t0,1\n', { delimiter: '\t', decimalSeparator: ',' }],
    ['whitespace columns, free-text preamble, Å header', 'Scan of filter 7\nOperator: someone\nWavelength (A)   T\n6500  0.1\n6520  0.5\n6540  0.9\n6560  0.5\n6580  0.1\n', { delimiter: 'whitespace', wavelengthUnit: 'angstrom', headerLines: 3 }],
    ['# comments everywhere', '# instrument: grating\n# date: 2026-01-01\nwl,t\n650,0.1\n# mid-file remark\n652,0.5\n654,0.9\n\n656,0.5\n658,0.1\n# end\n', { headerLines: 3 }],
    ['descending µm', 'lambda_um T\n0.658 0.1\n0.656 0.5\n0.654 0.9\n0.652 0.5\n0.650 0.1\n', { wavelengthUnit: 'um' }],
    ['Ångström from magnitude', '6500,0.1\n6520,0.5\n6540,0.9\n6560,0.5\n6580,0.1\n', { wavelengthUnit: 'angstrom' }],
    ['µm from magnitude', '0.650;0.1\n0.652;0.5\n0.654;0.9\n0.656;0.5\n0.658;0.1\n', { wavelengthUnit: 'um', delimiter: ';' }],
    ['percent from magnitude', '650,10\n652,50\n654,90\n656,50\n658,10\n', { transmissionUnit: 'percent' }],
    ['quoted CSV', '"wl","t"\n"650","0.1"\n"652","0.5"\n"654","0.9"\n"656","0.5"\n"658","0.1"\n', { delimiter: ',' }],
    ['an index column before wavelength, a reference column after', 'n,wavelength,T,ref\n1,650,0.1,1\n2,652,0.5,1\n3,654,0.9,1\n4,656,0.5,1\n5,658,0.1,1\n', { wavelengthColumn: 1, transmissionColumn: 2 }],
    ['a name row and a unit row', 'Wavelength,Transmission\nnm,%\n650,10\n652,50\n654,90\n656,50\n658,10\n', { transmissionUnit: 'percent', headerLines: 2 }],
    ['a preamble date with commas', 'Date: 2026,01,02\nwl,t\n650,0.1\n652,0.5\n654,0.9\n656,0.5\n658,0.1\n', { headerLines: 2 }],
    ['old Mac CR line ends', 'wl,t\r650,0.1\r652,0.5\r654,0.9\r656,0.5\r658,0.1\r', { headerLines: 1 }],
  ];
  for (const [name, text, expected] of cases) {
    it(name, () => {
      const r = readCurveText(text);
      expect(r.points.wavelengthNm).toEqual(W.map((w) => expect.closeTo(w, 9)));
      expect(r.points.transmission).toEqual(T.map((t) => expect.closeTo(t, 12)));
      expect(r.assumed).toMatchObject(expected);
      expect(r.rowCount).toBe(5);
    });
  }

  it('reads optical density as T = 10^−OD', () => {
    const r = readCurveText('nm,OD\n650,2\n652,0.3\n654,0.05\n656,0.3\n658,3\n');
    expect(r.assumed.transmissionUnit).toBe('od');
    expect(r.points.transmission[0]).toBeCloseTo(0.01, 14);
    expect(r.points.transmission[4]).toBeCloseTo(0.001, 14);
  });

  it('reads bytes in UTF-8, UTF-16 with BOM and Windows-1252', () => {
    const text = 'λ (nm),T\n650,0.1\n652,0.5\n654,0.9\n656,0.5\n658,0.1\n';
    expect(readCurveText(new TextEncoder().encode(text)).points.wavelengthNm).toEqual(W);
    const utf16 = new Uint8Array(2 + text.length * 2);
    utf16[0] = 0xff;
    utf16[1] = 0xfe;
    for (let i = 0; i < text.length; i++) {
      utf16[2 + 2 * i] = text.charCodeAt(i) & 0xff;
      utf16[3 + 2 * i] = text.charCodeAt(i) >> 8;
    }
    expect(readCurveText(utf16).points.transmission).toEqual(T);
    const latin = Uint8Array.from([...'Wavelength (\xc5),T\n6500,0.1\n6520,0.5\n6540,0.9\n6560,0.5\n6580,0.1\n'].map((c) => c.charCodeAt(0)));
    const r = readCurveText(latin);
    expect(r.assumed.wavelengthUnit).toBe('angstrom');
    expect(r.assumed.columns[0]).toBe('Wavelength (Å)');
  });

  it('lets every assumption be overridden', () => {
    const text = 'x;y;z\n1;650;10\n2;652;50\n3;654;90\n4;656;50\n5;658;10\n';
    const r = readCurveText(text, { wavelengthColumn: 1, transmissionColumn: 2, transmissionUnit: 'percent', delimiter: ';', decimalSeparator: '.', headerLines: 1, wavelengthUnit: 'nm' });
    expect(r.points.wavelengthNm).toEqual(W);
    expect(r.points.transmission).toEqual(T);
    const asAngstrom = readCurveText('650,0.1\n652,0.5\n654,0.9\n656,0.5\n658,0.1\n', { wavelengthUnit: 'angstrom' });
    expect(asAngstrom.points.wavelengthNm[0]).toBeCloseTo(65, 12);
  });

  it('merges an exactly repeated row and sorts shuffled rows, saying so', () => {
    const r = readCurveText('wl,t\n654,0.9\n650,0.1\n652,0.5\n652,0.5\n658,0.1\n656,0.5\n');
    expect(r.points.wavelengthNm).toEqual(W);
    expect(r.rowCount).toBe(6);
    expect(r.warnings.join(' ')).toMatch(/merged/);
    expect(r.warnings.join(' ')).toMatch(/sorted/);
  });

  it('clamps small negative readings (noise) to 0 with a warning', () => {
    const r = readCurveText('wl,t\n650,-0.004\n652,0.5\n654,0.9\n656,0.5\n658,-0.001\n');
    expect(r.points.transmission[0]).toBe(0);
    expect(r.points.transmission[4]).toBe(0);
    expect(r.warnings.join(' ')).toMatch(/2 slightly negative/);
  });
});

describe('refusals name the line of the original file', () => {
  it('an unreadable number', () => {
    const e = refusal('# c\nwl,t\n650,0.1\n652,0.5\n654,abc\n656,0.5\n658,0.1\n');
    expect(e.status).toBe(422);
    expect(e.details[0].line).toBe(5);
    expect(e.message).toMatch(/Line 5/);
  });
  it('a negative transmission beyond noise', () => {
    expect(refusal('wl,t\n650,0.1\n652,-0.02\n654,0.9\n656,0.5\n658,0.1\n').details[0]).toMatchObject({ line: 3, message: expect.stringMatching(/negative/) });
  });
  it('an absurd transmission above 150 %', () => {
    expect(refusal('wl,T (%)\n650,10\n652,50\n654,190\n656,50\n658,10\n').details[0]).toMatchObject({ line: 4, message: expect.stringMatching(/150 %/) });
    expect(refusal('650,0.1\n652,0.5\n654,1.7\n656,0.5\n658,0.1\n', { transmissionUnit: 'fraction' }).details[0].line).toBe(3);
  });
  it('a zero, negative or infinite wavelength', () => {
    expect(refusal('wl,t\n650,0.1\n0,0.5\n654,0.9\n656,0.5\n658,0.1\n').details[0].line).toBe(3);
    expect(refusal('wl,t\n650,0.1\n652,0.5\n654,0.9\n-656,0.5\n658,0.1\n').details[0].line).toBe(5);
    expect(refusal('wl,t\n650,0.1\n652,0.5\n1e400,0.9\n656,0.5\n658,0.1\n').details[0].line).toBe(4);
  });
  it('a repeated wavelength with two different values, naming both lines', () => {
    const e = refusal('wl,t\n650,0.1\n652,0.5\n654,0.9\n652,0.6\n658,0.1\n');
    expect(e.details[0].line).toBe(5);
    expect(e.details[0].message).toMatch(/lines 3 and 5/);
  });
  it('fewer than 5 points', () => {
    const e = refusal('wl,t\n650,0.1\n652,0.5\n654,0.9\n');
    expect(e.status).toBe(422);
    expect(e.message).toMatch(/at least 5/);
    expect(e.details[0].line).toBe(4);
  });
  it('a single column', () => {
    const e = refusal('# one column\n650\n652\n654\n656\n658\n');
    expect(e.details[0]).toMatchObject({ line: 2, message: expect.stringMatching(/one column/) });
  });
  it('a row with a missing value', () => {
    expect(refusal('wl,t\n650,0.1\n652,0.5\n654\n656,0.5\n658,0.1\n').details[0].line).toBe(4);
  });
  it('a bad value in the last row is reported, not left out as a footer', () => {
    expect(refusal('wl,t\n650,0.1\n652,0.5\n654,0.9\n656,0.5\n658,abc\nEnd of data\n').details[0].line).toBe(6);
  });
  it('binary content: NUL bytes (with their line) or mostly non-printable text', () => {
    const bytes = new TextEncoder().encode('wl,t\n650,0.1\n652,0.5\nxx');
    const withNul = new Uint8Array([...bytes, 0, 1, 2]);
    const e = refusal(withNul);
    expect(e.status).toBe(422);
    expect(e.details[0].line).toBe(4);
    expect(refusal('\x01\x02\x03\x04\x05\x06\x07\x08ab\x0e\x0f\x10\x11\x12').message).toMatch(/binary/);
  });
  it('a file over 5 MB (413)', () => {
    const e = refusal(new Uint8Array(MAX_FILE_BYTES + 1).fill(0x31));
    expect(e.status).toBe(413);
    expect(refusal('1'.repeat(MAX_FILE_BYTES + 1)).status).toBe(413);
  });
  it('more than 200 000 data rows (413)', () => {
    const rows: string[] = [];
    for (let i = 0; i <= MAX_ROWS; i++) rows.push(`${400 + i * 0.001},0.5`);
    const e = refusal(rows.join('\n'));
    expect(e.status).toBe(413);
    expect(e.details[0].line).toBe(MAX_ROWS + 1);
  }, 60_000);
  it('no numbers at all', () => {
    expect(refusal('hello\nworld\n').message).toMatch(/no rows of numbers/);
  });
  it('a column index that does not exist', () => {
    expect(refusal('650,0.1\n652,0.5\n654,0.9\n656,0.5\n658,0.1\n', { transmissionColumn: 5 }).message).toMatch(/does not exist/);
  });
  it('lists several problems at once, first one in the message', () => {
    const e = refusal('wl,t\n650,0.1\n652,x\n654,0.9\n656,y\n658,0.1\n660,0\n');
    expect(e.details.map((d) => d.line)).toEqual([3, 5]);
    expect(e.message).toMatch(/Line 3.*1 more problem/);
  });
});

describe('properties (fast-check)', () => {
  const row = fc.record({
    w: fc.double({ min: 200, max: 2000, noNaN: true }),
    t: fc.double({ min: 0, max: 1, noNaN: true }),
  });
  const layout = fc.record({
    sep: fc.constantFrom(',', ';', '\t', ' ', '  '),
    header: fc.boolean(),
    crlf: fc.boolean(),
    comments: fc.boolean(),
  });

  it('whatever it accepts comes back sorted, finite and strictly increasing, within 0–1.5', () => {
    fc.assert(
      fc.property(fc.array(row, { minLength: 1, maxLength: 60 }), layout, (rows, l) => {
        const lines: string[] = [];
        if (l.comments) lines.push('# generated');
        if (l.header) lines.push(`wavelength${l.sep}transmission`);
        for (const r of rows) lines.push(`${r.w}${l.sep}${r.t}`);
        let res;
        try {
          res = readCurveText(lines.join(l.crlf ? '\r\n' : '\n'));
        } catch (e) {
          expect(e).toBeInstanceOf(CurveReadError);
          return;
        }
        const { wavelengthNm: x, transmission: y } = res.points;
        expect(x.length).toBe(y.length);
        expect(x.length).toBeGreaterThanOrEqual(5);
        for (let i = 0; i < x.length; i++) {
          expect(Number.isFinite(x[i]) && x[i] > 0).toBe(true);
          expect(y[i] >= 0 && y[i] <= 1.5).toBe(true);
          if (i > 0) expect(x[i]).toBeGreaterThan(x[i - 1]);
        }
      }),
      { numRuns: 300 },
    );
  }, 60_000);

  it('never throws anything but a CurveReadError on arbitrary text', () => {
    fc.assert(
      fc.property(fc.string({ maxLength: 400 }), (s) => {
        try {
          readCurveText(s);
        } catch (e) {
          expect(e).toBeInstanceOf(CurveReadError);
        }
      }),
      { numRuns: 300 },
    );
  });

  it('reads a shuffled, duplicated copy of a curve back to the same sorted points', () => {
    fc.assert(
      fc.property(fc.uniqueArray(fc.integer({ min: 4000, max: 9000 }), { minLength: 5, maxLength: 40 }), fc.integer(), (ws, seed) => {
        const rows = ws.map((w) => ({ w: w / 10, t: ((w * 7919) % 1000) / 1000 }));
        const shuffled = [...rows, rows[0]].sort((a, b) => ((a.w * 31 + seed) % 17) - ((b.w * 31 + seed) % 17));
        const r = readCurveText(shuffled.map((p) => `${p.w},${p.t}`).join('\n'));
        const sorted = [...rows].sort((a, b) => a.w - b.w);
        expect(r.points.wavelengthNm).toEqual(sorted.map((p) => p.w));
        expect(r.points.transmission).toEqual(sorted.map((p) => p.t));
      }),
      { numRuns: 200 },
    );
  });
});

describe('large files', () => {
  it('reads the maximum row count', () => {
    const rows: string[] = ['wavelength_nm\ttransmission'];
    for (let i = 0; i < MAX_ROWS; i++) rows.push(`${(300 + i * 0.004).toFixed(3)}\t${(0.5 + 0.4 * Math.sin(i / 500)).toFixed(5)}`);
    const r = readCurveText(rows.join('\n'));
    expect(r.rowCount).toBe(MAX_ROWS);
    expect(r.points.wavelengthNm).toHaveLength(MAX_ROWS);
  }, 60_000);
});
