import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { writeCurveCsv } from '@/lib/engine/csv';
import { readCurveText } from '@/lib/engine/reader';

describe('export format', () => {
  it('writes a marker line, # metadata, the header and full-precision rows', () => {
    const csv = writeCurveCsv(
      { label: 'Test 3nm', aoi_deg: 0, lines: ['Ha', 'NII-658'], serial: undefined, notes: null },
      { wavelengthNm: [656.1, 656.2], transmission: [0.1234567890123, 1 / 3] },
    );
    expect(csv.split('\n')).toEqual([
      '# bandcone curve',
      '# label: Test 3nm',
      '# aoi_deg: 0',
      '# lines: Ha; NII-658',
      'wavelength_nm,transmission',
      '656.1,0.1234567890123',
      `656.2,${String(1 / 3)}`,
      '',
    ]);
  });

  it('keeps each metadata value on one line, so text cannot forge data rows', () => {
    const csv = writeCurveCsv({ notes: 'first\n650,0.9\r\nsecond' }, { wavelengthNm: [1, 2], transmission: [0, 0] });
    expect(csv).toContain('# notes: first 650,0.9 second\n');
  });
});

describe('spreadsheet formula injection (OWASP CSV injection guidance, common practice)', () => {
  // The full rule is tested in tests/unit/csv/formula-safe.test.ts; here, what this writer shows.
  it('leaves a formula inside a comment cell alone but neutralises what follows a separator; numbers stay numbers', () => {
    const csv = writeCurveCsv({ label: '=HYPERLINK("x")', contributor: 'x,=1+1', preshift: -0.5, tags: ['@a', 'b'] }, { wavelengthNm: [1], transmission: [0] });
    expect(csv).toContain(`# label: =HYPERLINK("x")\n`);
    expect(csv).toContain(`# contributor: x,'=1+1\n`);
    expect(csv).toContain('# preshift: -0.5\n');
    expect(csv).toContain('# tags: @a; b\n');
  });
});

describe('round trip (fast-check): the reader returns exactly what the writer wrote', () => {
  const curve = fc
    .uniqueArray(fc.double({ min: 100, max: 5000, noNaN: true, noDefaultInfinity: true }), { minLength: 5, maxLength: 80 })
    .chain((ws) =>
      fc.record({
        wavelengthNm: fc.constant([...ws].sort((a, b) => a - b)),
        transmission: fc.array(fc.double({ min: 0, max: 1.5, noNaN: true }), { minLength: ws.length, maxLength: ws.length }),
      }),
    )
    .map((p) => ({ wavelengthNm: p.wavelengthNm, transmission: p.transmission.map((t) => (Object.is(t, -0) ? 0 : t)) }));
  const meta = fc.dictionary(fc.string({ maxLength: 12 }), fc.oneof(fc.string({ maxLength: 40 }), fc.double({ noNaN: true }), fc.array(fc.string({ maxLength: 8 }), { maxLength: 3 })), { maxKeys: 5 });

  it('for arbitrary curves and metadata', () => {
    fc.assert(
      fc.property(curve, meta, (points, m) => {
        const back = readCurveText(writeCurveCsv(m, points));
        expect(back.points.wavelengthNm).toEqual(points.wavelengthNm);
        expect(back.points.transmission).toEqual(points.transmission);
        expect(back.assumed).toMatchObject({ wavelengthUnit: 'nm', transmissionUnit: 'fraction', delimiter: ',' });
      }),
      { numRuns: 300 },
    );
  });

  it('also as bytes', () => {
    fc.assert(
      fc.property(curve, (points) => {
        const back = readCurveText(new TextEncoder().encode(writeCurveCsv({ label: 'x' }, points)));
        expect(back.points).toEqual(points);
      }),
      { numRuns: 100 },
    );
  });
});
