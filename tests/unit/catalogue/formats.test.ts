import { describe, expect, it } from 'vitest';
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { convert } from 'jcampconverter';
import { toJcamp, jcampText, JCAMP_YFACTOR } from '@/lib/catalogue/formats/jcamp';
import { toVotable, xmlText } from '@/lib/catalogue/formats/votable';
import { bibtexText, toBibtex, toCsl } from '@/lib/catalogue/formats/cite';
import type { CurveRecord } from '@/lib/catalogue/formats/record';

function passband(x: number): number {
  const d = (x - 656.5) / 1.6;
  return 0.92 / (1 + d ** 6) + 1e-4;
}

function record(over: Partial<CurveRecord> = {}, evenlySpaced = true): CurveRecord {
  const wavelengthNm: number[] = [];
  if (evenlySpaced) for (let i = 0; i <= 400; i++) wavelengthNm.push(Number((646 + i * 0.05).toFixed(2)));
  else for (let x = 646; x < 667; x += 0.037 + 0.01 * Math.sin(x)) wavelengthNm.push(Number(x.toFixed(4)));
  return {
    id: 42,
    revision: 2,
    status: 'verified',
    title: 'Test filter',
    label: 'Nordvik Hα 3 nm <50mm> & "R&D" $$x',
    maker: 'Nordvik Optik',
    serial: 'SN-0042',
    lines: [{ id: 'Ha', name: 'Hα', wavelengthNm: 656.28 }],
    licence: 'CC-BY-4.0',
    contributor: 'Åsa Lindqvist',
    lab: 'Kvarnby Optical Lab\n2nd floor',
    measuredOn: '2026-03-14',
    verifiedAt: '2026-04-02T10:00:00.000Z',
    createdAt: '2026-03-20T10:00:00.000Z',
    instrument: 'spectrophotometer',
    aoiDeg: 0,
    method: { instrument: 'spectrophotometer', resolutionNm: 0.2, beam: 'converging', beamFNumber: 4, temperatureC: 21.5, polarization: 'unpolarized' },
    derived: { peakT: 0.9201, cwlNm: 656.5, fwhmNm: 3.2, nEff: 2.05 },
    url: 'https://bandcone.test/curves/42',
    points: { wavelengthNm, transmission: wavelengthNm.map(passband) },
    ...over,
  };
}

describe('JCAMP-DX 4.24 (McDonald & Wilks 1988), read back with the jcampconverter npm package', () => {
  it('evenly spaced: ##XYDATA=(X++(Y..Y)) reads back to the same points within YFACTOR', () => {
    const r = record();
    const text = toJcamp(r);
    expect(text).toContain('##XYDATA=(X++(Y..Y))');
    expect(text.split('\r\n').every((l) => l.length <= 80)).toBe(true);
    const parsed = convert(text);
    expect(parsed.flatten).toHaveLength(1);
    const s = parsed.flatten[0];
    expect(s.title).toContain('Bandcone curve 42 revision 2');
    const data = s.spectra[0].data;
    expect(data.x.length).toBe(r.points.wavelengthNm.length);
    for (let i = 0; i < data.x.length; i++) {
      expect(Math.abs(data.x[i] - r.points.wavelengthNm[i])).toBeLessThan(1e-9);
      expect(Math.abs(data.y[i] - r.points.transmission[i])).toBeLessThanOrEqual(JCAMP_YFACTOR / 2 + 1e-12);
    }
    expect(s.spectra[0].xUnits).toBe('NANOMETERS');
    expect(s.spectra[0].yUnits).toBe('TRANSMITTANCE');
    expect(s.dataType).toBe('UV/VIS SPECTRUM');
  });

  it('unevenly spaced: ##XYPOINTS=(XY..XY) reads back exactly', () => {
    const r = record({}, false);
    const text = toJcamp(r);
    expect(text).toContain('##XYPOINTS=(XY..XY)');
    // jcampconverter reads (XY..XY) pairs under ##XYDATA and ##PEAK TABLE but does not know the ##XYPOINTS label
    // (JCAMP-DX 4.24 §5); the pair syntax is the same, so it reads the body once the label is renamed.
    expect(convert(text).flatten[0].spectra).toEqual([]);
    const data = convert(text.replace('##XYPOINTS=(XY..XY)', '##XYDATA=(XY..XY)')).flatten[0].spectra[0].data;
    expect(data.x.length).toBe(r.points.wavelengthNm.length);
    expect(Array.from(data.x)).toEqual(r.points.wavelengthNm);
    expect(Array.from(data.y)).toEqual(r.points.transmission);
  });

  it('user text cannot end the block or open a comment: one ASCII line, no "$$"', () => {
    const r = record({ label: 'evil\n##END=\n$$ gone', lab: 'Ørsted lab' });
    const text = toJcamp(r);
    expect(text.split('\r\n').filter((l) => l.startsWith('##END=')).length).toBe(1);
    expect(jcampText('a$$b\nc')).toBe('a$ $b c');
    expect(jcampText('Åsa')).toBe('Asa');
    expect(/^[\x20-\x7e\r\n]*$/.test(text)).toBe(true);
    // the data still reads back after the hostile label
    expect(convert(text).flatten[0].spectra[0].data.x.length).toBe(r.points.wavelengthNm.length);
  });
});

/** Debian's python3 with astropy: test.sh installs python3-astropy; the pyenv python on PATH may lack it. */
function astropyPython(): string {
  for (const py of ['/usr/bin/python3', 'python3']) {
    const r = spawnSync(py, ['-c', 'import astropy.io.votable'], { encoding: 'utf8' });
    if (r.status === 0) return py;
  }
  throw new Error('No python3 with astropy (Debian package python3-astropy); ./scripts/test.sh installs it.');
}

const VALIDATE = `
import sys, json, warnings
from astropy.io.votable import parse, validate
import astropy.io.votable as v, os
path = sys.argv[1]
ok = validate(path, output=None, xmllint=False)
t = parse(path, verify='exception')
tab = t.get_first_table()
a = tab.array
f = {fld.name: fld for fld in tab.fields}
p = {pr.name: (float(pr.value) if pr.datatype == 'double' else str(pr.value), str(pr.unit) if pr.unit is not None else None) for pr in t.resources[0].params}
print(json.dumps({
  'valid': bool(ok), 'version': t.version,
  'units': {k: (str(fl.unit) if fl.unit is not None else None) for k, fl in f.items()},
  'dimensionless': str(f['transmission'].unit.physical_type) if f['transmission'].unit is not None else None,
  'ucd': {k: fl.ucd for k, fl in f.items()},
  'x': [float(v) for v in a['wavelength']], 'y': [float(v) for v in a['transmission']],
  'params': p,
  'xsd': os.path.join(os.path.dirname(v.__file__), 'data', 'VOTable.v1.4.xsd'),
}))
`;

describe('VOTable 1.4 (IVOA Recommendation), validated by astropy.io.votable against the standard', () => {
  const py = astropyPython();
  const dir = mkdtempSync(path.join(tmpdir(), 'bandcone-votable-'));
  const r = record();
  const file = path.join(dir, 'curve.xml');
  writeFileSync(file, toVotable(r));
  const out = JSON.parse(execFileSync(py, ['-c', VALIDATE, file], { encoding: 'utf8' })) as {
    valid: boolean; version: string; units: Record<string, string | null>; dimensionless: string; ucd: Record<string, string>;
    x: number[]; y: number[]; params: Record<string, [string | number, string | null]>; xsd: string;
  };

  it('passes astropy validate() and parse(verify="exception"), version 1.4', () => {
    expect(out.valid).toBe(true);
    expect(out.version).toBe('1.4');
  });

  it('FIELDs carry units nm and dimensionless, and the points read back exactly', () => {
    expect(out.units.wavelength).toBe('nm');
    expect(out.dimensionless).toBe('dimensionless');
    expect(out.ucd).toEqual({ wavelength: 'em.wl', transmission: 'phys.transmission' });
    expect(out.x).toEqual(r.points.wavelengthNm);
    expect(out.y).toEqual(r.points.transmission);
  });

  it('the method travels as PARAMs with units; provenance and hostile text survive escaping', () => {
    expect(out.params.resolution).toEqual([0.2, 'nm']);
    expect(out.params.aoi).toEqual([0, 'deg']);
    expect(out.params.beam[0]).toBe('converging');
    expect(out.params.beam_f_number[0]).toBe(4);
    expect(out.params.temperature[1]).toBe('K');
    expect(out.params.temperature[0]).toBeCloseTo(294.65, 6);
    expect(out.params.instrument[0]).toBe('spectrophotometer');
    expect(out.params.label[0]).toBe(r.label);
    expect(out.params.lab[0]).toBe(r.lab);
    expect(out.params.revision[0]).toBe(2);
    expect(out.params.url[0]).toBe(r.url);
    expect(out.params.licence[0]).toBe('CC-BY-4.0');
  });

  it('validates against the VOTable 1.4 XSD with xmllint when libxml2-utils is installed', () => {
    const xmllint = ['/usr/bin/xmllint', '/bin/xmllint'].find((p) => existsSync(p));
    if (!xmllint) return; // optional second validator; astropy above is the required one
    const res = spawnSync(xmllint, ['--noout', '--schema', out.xsd, file], { encoding: 'utf8' });
    expect(res.stderr).toContain('validates');
    expect(res.status).toBe(0);
  });

  it('xmlText escapes the XML specials and drops forbidden control characters', () => {
    expect(xmlText(`a<b>&"'\u0001\n`)).toBe('a&lt;b&gt;&amp;&quot;&apos;&#10;');
  });
});

// Top-level properties the CSL-JSON data schema allows (citation-style-language/schema, schemas/input/csl-data.json,
// "additionalProperties": false); a key outside it makes citeproc processors refuse the item.
const CSL_KEYS = new Set(
  ('type id categories language journalAbbreviation shortTitle author chair collection-editor compiler composer container-author contributor curator director editor ' +
    'editorial-director executive-producer interviewer illustrator organizer original-author performer producer recipient reviewed-author translator accessed available-date ' +
    'container event-date issued original-date submitted abstract annote archive archive_collection archive_location archive-place authority call-number chapter-number ' +
    'citation-number citation-label collection-number collection-title container-title container-title-short dimensions division DOI edition event event-place ' +
    'first-reference-note-number genre ISAN ISBN ISCI ISMN ISRC ISSN ISWC issue jurisdiction keyword locator medium note number number-of-pages number-of-volumes ' +
    'original-publisher original-publisher-place original-title page page-first part part-title PMCID PMID printing publisher publisher-place references reviewed-title ' +
    'scale section source status supplement title title-short translated-title translated-title-short URL version volume year-suffix custom').split(' '),
);
const CSL_TYPES = new Set(['dataset', 'webpage', 'document', 'report']);

describe('citation formats', () => {
  it('CSL-JSON: one item of type dataset with only the keys the CSL data schema allows', () => {
    const [item] = toCsl(record()) as Record<string, unknown>[];
    expect(CSL_TYPES.has(item.type as string)).toBe(true);
    expect(Object.keys(item).filter((k) => !CSL_KEYS.has(k))).toEqual([]);
    expect(item.issued).toEqual({ 'date-parts': [[2026, 4, 2]] });
    expect(item.version).toBe('2');
    expect(item.URL).toBe('https://bandcone.test/curves/42');
    expect(item.author).toEqual([{ literal: 'Åsa Lindqvist' }]);
  });

  it('BibTeX: LaTeX specials escaped, braces balanced, revision, date, lab, licence and permanent URL present', () => {
    const text = toBibtex(record());
    expect(text.startsWith('@misc{bandcone-curve-42-r2,')).toBe(true);
    let depth = 0;
    for (const ch of text.replace(/\\[{}]/g, '')) {
      if (ch === '{') depth++;
      if (ch === '}') depth--;
      expect(depth).toBeGreaterThanOrEqual(0);
    }
    expect(depth).toBe(0);
    expect(text).toContain('year = {2026}');
    expect(text).toContain('version = {2}');
    expect(text).toContain('url = {https://bandcone.test/curves/42}');
    expect(text).toContain('licence CC-BY-4.0');
    expect(text).toContain('Kvarnby Optical Lab 2nd floor');
    expect(text).toContain('\\& "R\\&D" \\$\\$x');
    expect(bibtexText('50% of {x}_1 #2 ~ ^ \\')).toBe('50\\% of \\{x\\}\\_1 \\#2 \\~{} \\^{} \\textbackslash{}');
  });

  it('a pending revision says so in the citation', () => {
    expect(toBibtex(record({ status: 'pending', verifiedAt: null }))).toContain('not yet verified');
  });
});
