import { describe, expect, it } from 'vitest';
import {
  MISSING,
  formatDeg,
  formatFNumber,
  formatFwhm,
  formatNm,
  formatPercent,
  formatRatio,
  formatSignedNm,
  formatTick,
  formatTransmission,
  formatValue,
  roundTo,
  unitOf,
} from '@/components/charts/format';

describe('number formats', () => {
  it('prints wavelengths to 2 decimals with nm', () => {
    expect(formatNm(656.28)).toBe('656.28 nm');
    expect(formatNm(656.2)).toBe('656.20 nm');
    expect(formatNm(500.675)).toBe('500.68 nm');
    expect(formatFwhm(3.4249)).toBe('3.42 nm FWHM');
  });

  it('rounds half away from zero despite binary representation', () => {
    expect(roundTo(1.005, 2)).toBe(1.01);
    expect(roundTo(-1.005, 2)).toBe(-1.01);
    expect(roundTo(0.125, 2)).toBe(0.13);
    expect(formatPercent(87.45)).toBe('87.5 %');
  });

  it('never prints a negative zero', () => {
    expect(formatNm(-0.001)).toBe('0.00 nm');
    expect(formatSignedNm(-0.001)).toBe('0.00 nm');
    expect(formatPercent(-0.04)).toBe('0.0 %');
  });

  it('prints transmission fractions in percent to 1 decimal', () => {
    expect(formatTransmission(0.874)).toBe('87.4 %');
    expect(formatTransmission(1)).toBe('100.0 %');
    expect(formatTransmission(0.00049)).toBe('0.0 %');
    expect(formatPercent(87.4)).toBe('87.4 %');
  });

  it('prints f-numbers, angles, ratios and signed shifts', () => {
    expect(formatFNumber(2.5)).toBe('f/2.5');
    expect(formatFNumber(1.4)).toBe('f/1.4');
    expect(formatFNumber(4)).toBe('f/4.0');
    expect(formatDeg(4.27)).toBe('4.3°');
    expect(formatRatio(0.3)).toBe('0.30');
    expect(formatSignedNm(0.62)).toBe('+0.62 nm');
    expect(formatSignedNm(-0.3)).toBe('-0.30 nm');
  });

  it('shows a dash, not zero, for missing numbers', () => {
    for (const v of [null, undefined, NaN, Infinity]) {
      expect(formatNm(v)).toBe(MISSING);
      expect(formatTransmission(v)).toBe(MISSING);
      expect(formatFNumber(v)).toBe(MISSING);
      expect(formatFwhm(v)).toBe(MISSING);
      expect(formatValue(v, { decimals: 1, unit: 'nm' })).toBe(MISSING);
    }
  });

  it('formats by declared kind', () => {
    expect(formatValue(656.281, 'nm')).toBe('656.28 nm');
    expect(formatValue(0.5, 'nm-signed')).toBe('+0.50 nm');
    expect(formatValue(0.874, 'fraction-percent')).toBe('87.4 %');
    expect(formatValue(87.4, 'percent')).toBe('87.4 %');
    expect(formatValue(2.5, 'fnumber')).toBe('f/2.5');
    expect(formatValue(12.345, { decimals: 1, unit: '°' })).toBe('12.3°');
    expect(formatValue(1.5, { decimals: 3, unit: 'mm', signed: true })).toBe('+1.500 mm');
    expect(formatValue(1.23456)).toBe('1.23');
  });

  it('keeps axis ticks short and free of float noise', () => {
    expect(formatTick(650, 'nm')).toBe('650');
    expect(formatTick(652.5, 'nm')).toBe('652.5');
    expect(formatTick(0.1 + 0.2, 'number')).toBe('0.3');
    expect(formatTick(2, 'fnumber')).toBe('f/2');
    expect(formatTick(5, 'deg')).toBe('5°');
    expect(formatTick(0.5, 'nm-signed')).toBe('+0.5');
    expect(formatTick(0.25, 'fraction-percent')).toBe('25');
  });

  it('names the unit of a format for axis titles', () => {
    expect(unitOf('nm')).toBe('nm');
    expect(unitOf('fraction-percent')).toBe('%');
    expect(unitOf('fnumber')).toBeUndefined();
    expect(unitOf({ decimals: 1, unit: 'mm' })).toBe('mm');
  });
});
