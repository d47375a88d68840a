import { describe, expect, it } from 'vitest';
import { parseStudyQuery, readLine, readNumber, resolveSettings, studySearch, fallbackLineFor, MAX_STUDY_CURVES } from '@/lib/study/url-state';

const OPTICS = [
  { id: 1, name: 'Fast astrograph', fNumber: 2.5, obstruction: 0.36, fieldAngleDeg: 8 },
  { id: 2, name: 'Camera lens', fNumber: 1.6, obstruction: 0, fieldAngleDeg: 12 },
  { id: 7, name: 'Cassegrain', fNumber: 8.5, obstruction: 0.3, fieldAngleDeg: 1 },
];

describe('the study link', () => {
  it('reads curves as a comma list or repeated, drops repeats and junk, keeps at most four', () => {
    const q = parseStudyQuery(new URLSearchParams('curve=12,13&curve=12&curve=x&curve=-4&curve=14,15,16'));
    expect(q.curveIds).toEqual([12, 13, 14, 15].slice(0, MAX_STUDY_CURVES));
    expect(parseStudyQuery({ curve: ['3', '4,5'] }).curveIds).toEqual([3, 4, 5]);
  });

  it('reads the curve ids the interface shows (C-111) and refuses submission ids (S-87)', () => {
    expect(parseStudyQuery(new URLSearchParams('curve=C-111,c12,S-87,%2313')).curveIds).toEqual([111, 12, 13]);
  });

  it('writes the same link for the same study, without empty values, and reads it back unchanged', () => {
    const q = parseStudyQuery(new URLSearchParams('line=Ha&curve=9,2&optic=1&shift=0.5&map=sine&n='));
    const search = studySearch(q);
    expect(search).toBe('curve=9,2&optic=1&map=sine&shift=0.5&line=Ha');
    expect(parseStudyQuery(new URLSearchParams(search))).toEqual(q);
  });

  it('lets a typed optic replace the saved one in the link', () => {
    const q = parseStudyQuery(new URLSearchParams('curve=1&optic=2&f=1.8&obs=0.25'));
    expect(studySearch(q)).toBe('curve=1&f=1.8&obs=0.25');
  });
});

describe('reading typed values', () => {
  it('accepts a comma decimal and refuses words', () => {
    expect(readNumber('2,5')).toBe(2.5);
    expect(readNumber(' -0.75 ')).toBe(-0.75);
    expect(readNumber('.5')).toBe(0.5);
    expect(readNumber('2.')).toBe(2);
    expect(readNumber('fast')).toBeNull();
    expect(readNumber('1e400')).toBeNull();
  });

  it('knows lines by id, by name and by the names people type, or takes a wavelength', () => {
    expect(readLine('OIII').value).toEqual({ id: 'OIII' });
    expect(readLine('[O III]').value).toEqual({ id: 'OIII' });
    expect(readLine('H-alpha').value).toEqual({ id: 'Ha' });
    expect(readLine('Hβ').value).toEqual({ id: 'Hb' });
    expect(readLine('SII').value).toEqual({ id: 'SII-671' });
    expect(readLine('656.3 nm').value).toEqual({ nm: 656.3 });
    expect(readLine('3000').error).toMatch(/between 200 and 2500/);
    expect(readLine('sodium').error).toMatch(/neither a catalogue line/);
  });
});

describe('settings from the link', () => {
  it('falls back to the example closest to the default f/2.5 when no optic is named', () => {
    const r = resolveSettings(parseStudyQuery({}), OPTICS, { id: 'Ha' });
    expect(r.settings.optic).toMatchObject({ id: 1, fNumber: 2.5, obstruction: 0.36, fieldAngleDeg: 8, mapping: 'tangent' });
    expect(r.opticSource).toBe('default');
    expect(r.errors).toEqual({});
  });

  it('uses a named optic, and says so when it is not available', () => {
    expect(resolveSettings(parseStudyQuery({ optic: '7' }), OPTICS, { id: 'Ha' }).settings.optic.fNumber).toBe(8.5);
    const missing = resolveSettings(parseStudyQuery({ optic: '99' }), OPTICS, { id: 'Ha' });
    expect(missing.errors.optic).toMatch(/Optic 99 is not one you can use/);
    expect(missing.settings.optic.id).toBe(1);
  });

  it('names every value it cannot use, with its range, and keeps a usable study', () => {
    const r = resolveSettings(parseStudyQuery({ f: '0.3', obs: '0.95', field: '31', n: '5', shift: 'x', k: '2', v: '40000', line: 'sodium' }), OPTICS, { id: 'OIII' });
    expect(r.errors.f).toMatch(/between 0.5 and 40/);
    expect(r.errors.obs).toMatch(/between 0 and 0.9/);
    expect(r.errors.field).toMatch(/between 0 and 30°/);
    expect(r.errors.n).toMatch(/between 1 and 4/);
    expect(r.errors.shift).toMatch(/not a number/);
    expect(r.errors.k).toMatch(/between -1 and 1/);
    expect(r.errors.v).toMatch(/km\/s/);
    expect(r.errors.line).toBeDefined();
    expect(r.settings.optic.fNumber).toBe(2.5);
    expect(r.settings.nEff).toBeNull();
    expect(r.settings.preShiftNm).toBe(0);
    expect(r.settings.line).toEqual({ id: 'OIII' });
  });

  it('targets the first curve’s own line when none is typed', () => {
    expect(fallbackLineFor([{ lines: [] }, { lines: ['SII-671', 'SII-673'] }])).toEqual({ id: 'SII-671' });
    expect(fallbackLineFor([])).toEqual({ id: 'Ha' });
  });
});
