import { describe, expect, it } from 'vitest';
import { afterEach, vi } from 'vitest';
import { parseId, parseUuid } from '@/lib/http/ids';
import { parseCurveId } from '@/lib/catalogue/detail';
import { parseCompareIds } from '@/lib/catalogue/compare';
import { publicOrigin, siteUrl } from '@/lib/http/site';
import { safeRedirect } from '@/lib/auth/redirect';

describe('ids in paths are read strictly', () => {
  // Number() would read all of these as integers (ECMA-262 StringToNumber).
  it.each(['0x10', '0b1', '0o7', '1e1', '+7', ' 7', '7 ', '7.0', '٣', '', '0', '-1', '2147483648', '00000000001', '9'.repeat(400)])('refuses %j', (raw) => {
    expect(() => parseId(raw)).toThrow(expect.objectContaining({ status: 404 }));
    expect(() => parseCurveId(raw)).toThrow(expect.objectContaining({ status: 404 }));
    // the compare list trims its items ("1, 2"); everything else it refuses alike
    expect(parseCompareIds(raw.trim())).toEqual(raw.trim() === '7' ? [7] : []);
  });

  it('reads a compare list with the same rule, in order, without repeats', () => {
    expect(parseCompareIds('3, 0x10,7,3,1e1,2147483648,12')).toEqual([3, 7, 12]);
  });

  it.each([['1', 1], ['42', 42], ['0042', 42], ['2147483647', 2147483647]])('reads %j', (raw, id) => {
    expect(parseId(raw as string)).toBe(id);
  });

  it('reads a UUID (RFC 9562 8-4-4-4-12 hex form) and nothing else', () => {
    expect(parseUuid('3F2504E0-4F89-41D3-9A0C-0305E82C3301')).toBe('3f2504e0-4f89-41d3-9a0c-0305e82c3301');
    for (const bad of ['-'.repeat(36), '---', '3f2504e0-4f89-41d3-9a0c-0305e82c330g', '3f2504e04f8941d39a0c0305e82c3301ffff']) {
      expect(() => parseUuid(bad)).toThrow(expect.objectContaining({ status: 404 }));
    }
  });
});

describe('sign-in redirects stay on the site', () => {
  const baseUrl = 'http://127.0.0.1:3000';
  it.each([
    ['/account', `${baseUrl}/account`],
    ['http://127.0.0.1:3000/review', 'http://127.0.0.1:3000/review'],
    ['http://[', baseUrl],
    ['http://%zz', baseUrl],
    ['https://evil.invalid/', baseUrl],
    ['//evil.invalid/', baseUrl],
    ['/\\evil.invalid/', baseUrl],
  ])('%j → %j', (url, to) => {
    expect(safeRedirect({ url, baseUrl })).toBe(to);
  });
});

describe('the site address is worked out in one place', () => {
  afterEach(() => vi.unstubAllEnvs());

  it('mail links use the configured URL, citations its origin', () => {
    vi.stubEnv('NEXTAUTH_URL', 'https://filters.example.org/');
    expect(siteUrl()).toBe('https://filters.example.org/');
    expect(publicOrigin('http://10.0.0.5:3000')).toBe('https://filters.example.org');
  });

  it('without one, mail points at the local server and citations at the request address', () => {
    vi.stubEnv('NEXTAUTH_URL', undefined);
    expect(siteUrl()).toBe('http://127.0.0.1:3000');
    expect(publicOrigin('http://10.0.0.5:3000')).toBe('http://10.0.0.5:3000');
  });

  it('a malformed configured URL falls back to the request address', () => {
    vi.stubEnv('NEXTAUTH_URL', 'not a url');
    expect(publicOrigin('http://10.0.0.5:3000')).toBe('http://10.0.0.5:3000');
  });
});
