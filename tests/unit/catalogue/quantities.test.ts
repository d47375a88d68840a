import { describe, expect, it } from 'vitest';
import { readQuantity } from '@/lib/catalogue/quantities';
import { parseSearchParams } from '@/lib/catalogue/search-params';

// 1 Å = 0.1 nm (SI Brochure 9th ed. Table 8); "f/2" is a focal ratio of 2 and "40 %" a ratio of 0.40 (common practice).
describe('number fields read the forms people type, one rule with the search box', () => {
  it('f-number, percentages and obstruction', () => {
    expect(readQuantity('fNumber', 'f/2')).toEqual({ value: 2 });
    expect(readQuantity('fNumber', 'F2.8')).toEqual({ value: 2.8 });
    expect(readQuantity('fNumber', ' 2,5 ')).toEqual({ value: 2.5 });
    expect(readQuantity('minThroughput', '80 %', { percentField: true })).toEqual({ value: 0.8 });
    expect(readQuantity('minThroughput', '80%', { percentField: true })).toEqual({ value: 0.8 });
    expect(readQuantity('minThroughput', '80', { percentField: true })).toEqual({ value: 0.8 });
    expect(readQuantity('minThroughput', '0.8')).toEqual({ value: 0.8 });
    expect(readQuantity('minThroughput', '80 %')).toEqual({ value: 0.8 });
    expect(readQuantity('peakMin', '29', { percentField: true })).toEqual({ value: 0.29 });
    expect(readQuantity('obstruction', '40 %')).toEqual({ value: 0.4 });
    expect(readQuantity('obstruction', '40')).toEqual({ value: 0.4 });
    expect(readQuantity('obstruction', '0.4')).toEqual({ value: 0.4 });
    expect(readQuantity('fwhmMax', '50 Å')).toEqual({ value: 5 });
    expect(readQuantity('fwhmMax', '5nm')).toEqual({ value: 5 });
    expect(readQuantity('fieldAngleDeg', '8°')).toEqual({ value: 8 });
    expect(readQuantity('fNumber', '')).toEqual({ value: null });
  });

  it('says what is wrong, naming the field', () => {
    expect(readQuantity('fNumber', 'fast').error).toBe('f-number: “fast” is not a number such as 2, f/2 or F2.8');
    expect(readQuantity('fNumber', 'f/0.3').error).toMatch(/f-number must be between 0.5 and 40/);
    expect(readQuantity('obstruction', '95 %').error).toMatch(/Obstruction must be between 0 and 0.9/);
    expect(readQuantity('minThroughput', '120', { percentField: true }).error).toMatch(/Line throughput must be between 0 and 1/);
    expect(readQuantity('fwhmMax', '5 nm nm').error).toMatch(/is not a number/);
    expect(readQuantity('fwhmMax', '1'.repeat(41)).error).toMatch(/at most 40 characters/);
  });

  it('the API reads the same forms (GET /api/curves?fNumber=f/2&obstruction=40 %)', () => {
    const p = parseSearchParams({ fNumber: 'f/2', obstruction: '40 %', minThroughput: '80%', fwhmMax: '50 Å' });
    expect(p).toMatchObject({ fNumber: 2, obstruction: 0.4, minThroughput: 0.8, fwhmMax: 5 });
    expect(() => parseSearchParams({ fNumber: 'f/2', obstruction: 'lots' })).toThrow(/Obstruction: “lots” is not a number/);
  });
});
