import { describe, expect, it } from 'vitest';
import { readCurveText } from '@/lib/engine/reader';
import { angleFromHeader } from '@/lib/engine/reader/columns';
import { CurveReadError } from '@/lib/engine/errors';
import { angleScale } from '@/lib/engine/cone';
import { refusal } from '../../support/reader';

// Scans of one filter at several angles exported side by side, one pair of
// (wavelength, transmission) columns per angle (common practice of instrument
// software). The passband is a generalised Lorentzian whose CWL moves with the
// angle as CWL(θ) = CWL₀ · √(1 − sin²θ / n_eff²) (closed form, docs/model.md §Angle shift).

const CWL0 = 501.2;
const N_EFF = 1.9;
const ANGLES = [0, 8, 16];

function scan(aoi: number, n: number) {
  const cwl = CWL0 * angleScale(aoi, N_EFF);
  return Array.from({ length: n }, (_, i) => {
    const w = Number((cwl - 10 + i * 0.5).toFixed(2));
    return { w, t: Number((0.9 / (1 + ((2 * (w - cwl)) / 3) ** 4)).toFixed(5)) };
  });
}

function sideBySide(lengths: number[], header: string[] | null) {
  const scans = ANGLES.map((a, k) => scan(a, lengths[k]));
  const rows = Array.from({ length: Math.max(...lengths) }, (_, i) => scans.map((s) => (s[i] ? `${s[i].w},${s[i].t}` : ',')).join(','));
  return { text: [...(header ? [header.join(',')] : []), ...rows].join('\n'), scans };
}


describe('column pairs side by side', () => {
  const header = ['Wavelength 0° (nm)', 'T 0° (%)', 'Wavelength 8° (nm)', 'T 8° (%)', 'Wavelength 16° (nm)', 'T 16° (%)'].map((h) => h.replace(' (%)', ''));

  it('finds the pairs and their angles, reads the first by default and says so', () => {
    const { text, scans } = sideBySide([41, 41, 41], header);
    const r = readCurveText(text);
    expect(r.assumed).toMatchObject({ pairs: 3, pair: 1, pairAngles: [0, 8, 16], wavelengthColumn: 0, transmissionColumn: 1 });
    expect(r.points.wavelengthNm).toEqual(scans[0].map((p) => p.w));
    expect(r.warnings.join(' ')).toMatch(/3 pairs of columns side by side \(at 0°, 8°, 16°\)/);
  });

  it('reads the pair asked for, each pair a curve whose CWL moves as the closed form says', () => {
    const { text, scans } = sideBySide([41, 37, 33], header);
    for (let k = 0; k < 3; k++) {
      const r = readCurveText(text, { pair: k + 1 });
      expect(r.assumed).toMatchObject({ pair: k + 1, wavelengthColumn: 2 * k, transmissionColumn: 2 * k + 1 });
      // shorter scans are padded with blank fields, which are not rows
      expect(r.points.wavelengthNm).toEqual(scans[k].map((p) => p.w));
      expect(r.points.transmission).toEqual(scans[k].map((p) => p.t));
      const peak = r.points.wavelengthNm[r.points.transmission.indexOf(Math.max(...r.points.transmission))];
      expect(peak).toBeCloseTo(CWL0 * angleScale(ANGLES[k], N_EFF), 0);
    }
  });

  it('without a header the pairs are found from the values, with no angles', () => {
    const { text } = sideBySide([21, 21, 21], null);
    expect(readCurveText(text).assumed).toMatchObject({ pairs: 3, pairAngles: [null, null, null] });
  });

  it('a pair that does not exist is refused naming the first data line', () => {
    const { text } = sideBySide([21, 21, 21], header);
    expect(refusal(text, { pair: 4 }).details[0]).toEqual({ line: 2, message: 'column pair 4 does not exist; the data rows have 6 columns (3 pairs)' });
  });

  it('a wavelength column with two transmission columns is not a set of pairs', () => {
    const r = readCurveText('wl,t,ref,dark\n650,0.1,1,0\n652,0.5,1,0\n654,0.9,1,0\n656,0.5,1,0\n658,0.1,1,0\n');
    expect(r.assumed.pairs).toBe(0);
    expect(r.assumed.pair).toBe(0);
  });

  it('reads angles as headers write them', () => {
    expect(angleFromHeader('t @ 12.5°')).toBe(12.5);
    expect(angleFromHeader('t_10deg')).toBe(10);
    expect(angleFromHeader('aoi=7')).toBe(7);
    expect(angleFromHeader('angle: 20 (sample)')).toBe(20);
    expect(angleFromHeader('θ 5')).toBe(5);
    expect(angleFromHeader('transmission (%)')).toBeNull();
    expect(angleFromHeader('400 deg')).toBeNull();
  });
});
