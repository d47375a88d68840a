import { describe, expect, it } from 'vitest';
import { readQueryText, readSearchWords } from '@/lib/catalogue/read-query';
import { MAX_TYPED_LENGTH, tokenize } from '@/lib/catalogue/quantities';
import { parseSearchParams } from '@/lib/catalogue/search-params';

const params = (text: string) => readQueryText(text).understood.map((u) => [u.kind, u.params]);

describe('words with numbers in the search box', () => {
  it('reads a line name in every usual spelling (line designations as in the IAU style: Hα, [O III], [S II]; O3/S2 common practice)', () => {
    for (const s of ['Hα', 'H-alpha', 'H alpha', 'Ha', 'HA', 'Halpha', 'h-α', 'hydrogen alpha']) expect(params(s), s).toEqual([['line', { line: 'Ha' }]]);
    for (const s of ['OIII', '[O III]', 'O III', 'O3', 'oiii', '[OIII]']) expect(params(s), s).toEqual([['line', { line: 'OIII' }]]);
    for (const s of ['S2', 'SII', '[S II]', 's ii']) expect(params(s), s).toEqual([['line', { line: 'SII-671' }]]);
    expect(params('Hβ')).toEqual([['line', { line: 'Hb' }]]);
    expect(params('N2')).toEqual([['line', { line: 'NII-658' }]]);
    expect(params('He II')).toEqual([['line', { line: 'HeII' }]]);
  });

  it('reads a width within ±20 %, in nm or ångström (1 Å = 0.1 nm, SI Brochure 9th ed. Table 8)', () => {
    expect(params('5 nm')).toEqual([['width', { fwhmMin: 4, fwhmMax: 6 }]]);
    expect(params('5nm')).toEqual([['width', { fwhmMin: 4, fwhmMax: 6 }]]);
    expect(params('50 Å')).toEqual([['width', { fwhmMin: 4, fwhmMax: 6 }]]);
    expect(params('50Å')).toEqual([['width', { fwhmMin: 4, fwhmMax: 6 }]]);
    expect(params('3 nm')).toEqual([['width', { fwhmMin: 2.4, fwhmMax: 3.6 }]]);
    expect(params('6,5 nm')).toEqual([['width', { fwhmMin: 5.2, fwhmMax: 7.8 }]]);
    // a wavelength rather than a width
    expect(params('656 nm')).toEqual([['cwl', { cwlMin: 651, cwlMax: 661 }]]);
  });

  it('reads an optic, an obstruction and a threshold', () => {
    for (const s of ['f/2', 'f2', 'F/2.0', 'F2', 'f/2,0']) expect(params(s), s).toEqual([['optic', { fNumber: 2 }]]);
    expect(params('F2.8')).toEqual([['optic', { fNumber: 2.8 }]]);
    expect(params('40 % obstruction')).toEqual([['obstruction', { obstruction: 0.4 }]]);
    expect(params('40% obstruction')).toEqual([['obstruction', { obstruction: 0.4 }]]);
    expect(params('obstruction 0.36')).toEqual([['obstruction', { obstruction: 0.36 }]]);
    expect(params('80 %')).toEqual([['threshold', { peakMin: 0.8 }]]);
    expect(params('f/2 80%')).toEqual([['optic', { fNumber: 2 }], ['threshold', { minThroughput: 0.8 }]]);
    expect(readQueryText('80 %', true).understood[0].params).toEqual({ minThroughput: 0.8 });
  });

  it('keeps the rest as words, spaced as typed', () => {
    expect(readQueryText('H-alpha 5 nm meadow optics')).toMatchObject({ words: 'meadow optics' });
    expect(readQueryText('Hα 3 nm f/2 40 % obstruction 80 % coating')).toMatchObject({ words: 'coating' });
    expect(readQueryText('3-cavity').words).toBe('3-cavity');
    expect(readQueryText('3-cavity').understood).toEqual([]);
    expect(readQueryText('fast filters').words).toBe('fast filters');
    // a second width stays words: one width per search
    expect(readQueryText('5 nm 7 nm')).toMatchObject({ words: '7 nm' });
    // punctuation alone is no word
    expect(readQueryText('[O III] ,').words).toBe('');
    expect(readQueryText('5 nm').understood[0].text).toBe('5 nm');
    expect(readQueryText('see H-alpha here').understood[0].text).toBe('H-alpha');
  });

  it('leaves numbers out of range as words', () => {
    expect(readQueryText('f/100').understood).toEqual([]);
    expect(readQueryText('f/100').words).toBe('f/100');
    expect(readQueryText('95 % obstruction').understood).toEqual([]);
    expect(readQueryText('150 %').understood).toEqual([]);
  });

  it('explicit parameters win over the words, and an obstruction without an optic waits for one', () => {
    const r = readSearchWords(parseSearchParams({ q: 'Hα 5 nm 40 % obstruction dusk', fwhmMax: '9' }));
    expect(r.params).toMatchObject({ line: 'Ha', fwhmMax: 9, q: 'dusk' });
    expect(r.params.fwhmMin).toBeUndefined();
    expect(r.params.obstruction).toBeUndefined();
    expect(r.understood.map((u) => [u.kind, u.applied])).toEqual([['line', true], ['width', false], ['obstruction', false]]);
    const withOptic = readSearchWords(parseSearchParams({ q: 'f/2 40 % obstruction' }));
    expect(withOptic.params).toMatchObject({ fNumber: 2, obstruction: 0.4 });
    expect(withOptic.params.q).toBeUndefined();
  });

  it('hostile input: reads at most MAX_TYPED_LENGTH characters, never throws, and cuts tokens in one pass', () => {
    const hostile = [
      '9'.repeat(1_000_000),
      '.'.repeat(100_000),
      'f/'.repeat(50_000),
      '['.repeat(10_000) + ']'.repeat(10_000),
      '1.1.1.1.1.1.1.1.1.1.1.1.1'.repeat(1000),
      '%'.repeat(1000) + 'nm'.repeat(1000),
      '😀'.repeat(500),
      'H-'.repeat(30_000) + 'alpha',
      '\u0000\u202e nm % f/ Å',
      'a'.repeat(199) + '😀',
    ];
    for (const h of hostile) {
      const r = readQueryText(h);
      expect(r.words.length).toBeLessThanOrEqual(MAX_TYPED_LENGTH);
      for (const u of r.understood) expect(h.slice(0, MAX_TYPED_LENGTH)).toContain(u.text);
      const tokens = tokenize(h);
      expect(tokens.length).toBeLessThanOrEqual(MAX_TYPED_LENGTH);
      // tokens are in order and never overlap
      for (let k = 1; k < tokens.length; k++) expect(tokens[k].start).toBeGreaterThanOrEqual(tokens[k - 1].end);
    }
    // a number longer than a double holds is read as one (Infinity), then refused by its range
    expect(readQueryText('9'.repeat(400) + ' nm').understood).toEqual([]);
  });
});
