import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { readCurveText } from '@/lib/engine/reader';
import { CurveReadError } from '@/lib/engine/errors';
import { refusal } from '../../support/reader';

// JCAMP-DX fixtures written by hand from the IUPAC format (McDonald & Wilks 1988,
// Appl. Spectrosc. 42:151): labelled records "##LABEL= value", X and Y scaled by
// XFACTOR and YFACTOR, (X++(Y..Y)) rows whose X advances by DELTAX per value, and
// the compressed forms, from memory of the paper's character table:
//   SQZ  @ A–I = 0 1–9, a–i = −1…−9 (first digit of a value, carrying its sign)
//   DIF  % J–R = 0 1–9, j–r = −1…−9 (a difference from the value before)
//   DUP  S–Z = 1–9 (how many times the value before occurs in all)
// and the Y check: the last value of a DIF line opens the next line again.
// The expected values below are decoded by hand from those rules.

const dir = path.join(import.meta.dirname, '..', '..', 'fixtures', 'jcamp');
const fixture = (name: string) => readFileSync(path.join(dir, name));


describe('JCAMP-DX', () => {
  it('uncompressed (X++(Y..Y)) with X and Y factors', () => {
    const r = readCurveText(fixture('affn-factors.jdx'));
    // X: 6500 × 0.1 = 650 nm, then + DELTAX (FIRSTX, LASTX and DELTAX are in real units) per value; Y × 0.0001
    expect(r.points.wavelengthNm).toEqual([650, 652, 654, 656, 658, 660, 662].map((w) => expect.closeTo(w, 9)));
    expect(r.points.transmission).toEqual([0.0123, 0.25, 0.7, 0.91, 0.7, 0.25, 0.0123].map((t) => expect.closeTo(t, 12)));
    expect(r.assumed).toMatchObject({ format: 'jcamp-dx', wavelengthUnit: 'nm', transmissionUnit: 'fraction', headerLines: 15 });
    expect(r.warnings[0]).toMatch(/JCAMP-DX \(“Invented 3-cavity filter, 656 nm, uncompressed”\): 7 points/);
  });

  it('compressed SQZ, DIF and DUP with the Y check across lines', () => {
    const r = readCurveText(fixture('compressed-difdup.jdx'));
    // 644: E0 = 50; %T = two zero steps; N0 = +50; K00 = +200; M00 = +400; K00 = +200
    // 656: I00 = 900 again (the check, not a new point); k00 −200; m00 −400; k00 −200; n0 −50; %T
    expect(r.points.wavelengthNm).toEqual([644, 646, 648, 650, 652, 654, 656, 658, 660, 662, 664, 666, 668]);
    expect(r.points.transmission).toEqual([50, 50, 50, 100, 300, 700, 900, 700, 300, 100, 50, 50, 50].map((y) => expect.closeTo(y / 1000, 12)));
  });

  it('(XY..XY) points in micrometres as absorbance (T = 10^−A)', () => {
    const r = readCurveText(fixture('xypoints-absorbance-um.jdx'));
    expect(r.assumed).toMatchObject({ wavelengthUnit: 'um', transmissionUnit: 'od' });
    expect(r.points.wavelengthNm).toEqual([650, 652, 654, 656, 658].map((w) => expect.closeTo(w, 9)));
    expect(r.points.transmission).toEqual([2, 0.3, 0.05, 0.3, 3].map((a) => expect.closeTo(10 ** -a, 12)));
  });

  it('a wavenumber axis becomes wavelength, λ = 10⁷ / ν̃', () => {
    const r = readCurveText(fixture('wavenumber.jdx'));
    expect(r.points.wavelengthNm).toEqual([12500, 12400, 12300, 12200, 12100].map((k) => expect.closeTo(1e7 / k, 9)));
    expect(r.points.transmission).toEqual([0.1, 0.5, 0.9, 0.5, 0.1]);
    expect(r.warnings.join(' ')).toMatch(/Wavenumbers/);
  });

  it('a LINK file with two spectra: the first by default, the other on request', () => {
    const first = readCurveText(fixture('link-two-scans.jdx'));
    expect(first.assumed).toMatchObject({ block: 1, blocks: 2 });
    expect(first.points.wavelengthNm).toEqual([640, 650, 660, 670, 680]);
    const second = readCurveText(fixture('link-two-scans.jdx'), { block: 2 });
    expect(second.points.wavelengthNm).toEqual([650, 652, 654, 656, 658]);
    expect(second.points.transmission).toEqual([0.1, 0.5, 0.9, 0.5, 0.1]);
    expect(refusal(fixture('link-two-scans.jdx').toString(), { block: 3 }).message).toMatch(/block 3 does not exist; the file holds 2 spectra/);
  });

  it('refuses what is not transmission, naming the data line', () => {
    const text = fixture('affn-factors.jdx').toString().replace('##YUNITS= TRANSMITTANCE', '##YUNITS= REFLECTANCE');
    expect(refusal(text).details[0]).toEqual({ line: 15, message: 'the spectrum holds REFLECTANCE, not transmission or absorbance' });
  });

  it('hostile input: an over-long line and a DUP count asking for a billion points', () => {
    const long = refusal(`##TITLE= x\n##XYDATA= (X++(Y..Y))\n650${' 1'.repeat(200)}\n##END=\n`);
    expect(long.details[0]).toMatchObject({ line: 3, message: expect.stringMatching(/JCAMP-DX line of 403 characters/) });
    const dup = refusal('##TITLE= x\n##XYDATA= (X++(Y..Y))\n650A00Z99999999\n##END=\n');
    expect(dup.status).toBe(413);
    expect(dup.details[0].line).toBe(3);
    // runs of blanks carry no meaning in the format and are collapsed first
    expect(readCurveText(fixture('affn-factors.jdx').toString().replace('6500 123', `6500${' '.repeat(5000)}123`)).rowCount).toBe(7);
  });
});
