import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { readCurveText } from '@/lib/engine/reader';
import { CurveReadError, EngineInputError } from '@/lib/engine/errors';
import { readerOptionsSchema } from '@/lib/schemas/model';
import { refusal } from '../../support/reader';

// Lab exports end with a footer ("End of data", a summary block, a checksum)
// and sometimes hold several scans. The data is the longest run of rows of the
// same shape; what was left out is reported in `assumed.skipped`. Footer forms
// below are common practice of spectrophotometer exports, invented here.

const W = [650, 652, 654, 656, 658];
const T = [0.1, 0.5, 0.9, 0.5, 0.1];
const rows = (ws = W, ts = T, sep = ',') => ws.map((w, i) => `${w}${sep}${ts[i]}`);


describe('a footer falls away', () => {
  it('"End of data", a summary block and a checksum line', () => {
    const text = ['Instrument export', 'wl,t', ...rows(), 'End of data', '', 'Summary', 'Peak T,0.9', 'Points,5', 'Checksum: 0x3F2A'].join('\n');
    const r = readCurveText(text);
    expect(r.points.wavelengthNm).toEqual(W);
    expect(r.points.transmission).toEqual(T);
    expect(r.assumed).toMatchObject({ headerLines: 2, footerLines: 6, block: 1, blocks: 1 });
    expect(r.assumed.skipped).toEqual([
      { from: 1, to: 2, what: 'header', text: 'Instrument export' },
      { from: 8, to: 13, what: 'footer', text: 'End of data' },
    ]);
    expect(r.warnings.join(' ')).toMatch(/Lines 8–13 after the data \(“End of data”\) were left out as a footer/);
  });

  it('a trailing line of one number (a checksum) is a footer, a row of numbers is not', () => {
    const r = readCurveText([...rows(), '12345678'].join('\n'));
    expect(r.points.wavelengthNm).toEqual(W);
    expect(r.assumed.footerLines).toBe(1);
    const six = readCurveText([...rows(), '660,0.05'].join('\n'));
    expect(six.points.wavelengthNm).toHaveLength(6);
    expect(six.assumed.footerLines).toBe(0);
  });

  it('footerLines cuts exactly that many lines, even rows of numbers', () => {
    const text = [...rows([...W, 660, 662], [...T, 0.05, 0.02]), 'total,2.17'].join('\n');
    const r = readCurveText(text, { footerLines: 3 });
    expect(r.points.wavelengthNm).toEqual(W);
    expect(r.assumed.footerLines).toBe(3);
  });

  it('header and footer lines set together read exactly the lines between', () => {
    const text = ['a', 'b', ...rows(), 'x', 'y'].join('\n');
    const r = readCurveText(text, { headerLines: 2, footerLines: 2 });
    expect(r.rowCount).toBe(5);
    expect(r.assumed).toMatchObject({ headerLines: 2, footerLines: 2 });
    // a text line inside the lines the caller marked as data is refused on its line
    expect(refusal(['a', ...rows(), 'x', 'y'].join('\n'), { headerLines: 1, footerLines: 1 }).details[0].line).toBe(7);
  });

  it('refuses footerLines that overlap the header, in the reader and the schema', () => {
    expect(() => readCurveText(rows().join('\n'), { headerLines: 3, footerLines: 3 })).toThrow(EngineInputError);
    expect(readerOptionsSchema.safeParse({ footerLines: -1 }).success).toBe(false);
    expect(readerOptionsSchema.safeParse({ footerLines: 4, block: 2 }).success).toBe(true);
  });
});

describe('several blocks of data', () => {
  const scan1 = ['Scan 1 (reference)', 'wl,t', ...rows([640, 650, 660, 670, 680], [1, 1, 1, 1, 1])];
  const scan2 = ['Scan 2 (sample)', 'wl,t', ...rows([...W, 660], [...T, 0.05])];
  const text = [...scan1, '', ...scan2, 'End'].join('\n');

  it('reads the largest block by default and says what else there was', () => {
    const r = readCurveText(text);
    expect(r.points.wavelengthNm).toEqual([...W, 660]);
    expect(r.assumed).toMatchObject({ block: 2, blocks: 2, headerLines: 10, footerLines: 1 });
    expect(r.assumed.skipped.map((k) => k.what)).toEqual(['header', 'other block', 'header', 'footer']);
    expect(r.assumed.skipped[1]).toMatchObject({ from: 3, to: 7, text: '640,1' });
    expect(r.warnings.join(' ')).toMatch(/Lines 3–7 hold another block of data/);
  });

  it('reads the block asked for, and refuses one that does not exist', () => {
    const first = readCurveText([...scan1, 'Dark', 'wl,t', ...rows([670, 680], [0, 0]), ...scan2].join('\n'), { block: 1 });
    expect(first.points.wavelengthNm).toEqual([640, 650, 660, 670, 680]);
    expect(first.assumed).toMatchObject({ block: 1, blocks: 3 });
    expect(refusal(text, { block: 3 }).message).toMatch(/block 3 does not exist; the file holds 2 blocks/);
  });

  it('one stray text line inside the data is refused on its line, not taken for a second block', () => {
    const e = refusal(['wl,t', ...rows().slice(0, 3), 'oops', ...rows([660, 662, 664], [0.1, 0.1, 0.1])].join('\n'));
    expect(e.details[0]).toEqual({ line: 5, message: '"oops" is not a row of numbers (comment it out with #)' });
  });

  it('a lone row of numbers in the preamble is not a block', () => {
    const r = readCurveText(['Date: 2026,01,02', 'Serial 12 34', 'wl,t', ...rows()].join('\n'));
    expect(r.assumed.blocks).toBe(1);
  });
});

describe('property (fast-check): any header and footer of text around the data fall away', () => {
  const textLine = fc.string({ unit: fc.constantFrom(...'abcdefgh :=#-()'), minLength: 1, maxLength: 30 }).filter((s) => /[a-h]/.test(s));
  it('reads the same points whatever text lines come before and after', () => {
    fc.assert(
      fc.property(fc.array(textLine, { maxLength: 6 }), fc.array(textLine, { maxLength: 6 }), fc.constantFrom(',', ';', '\t'), (head, foot, sep) => {
        const body = rows(W, T, sep);
        const r = readCurveText([...head, ...body, ...foot].join('\n'));
        expect(r.points.wavelengthNm).toEqual(W);
        expect(r.points.transmission).toEqual(T);
        expect(r.assumed.headerLines).toBe(head.length);
        expect(r.assumed.footerLines).toBe(foot.length);
      }),
      { numRuns: 300 },
    );
  });
});
