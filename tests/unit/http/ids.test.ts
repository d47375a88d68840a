import { describe, expect, it } from 'vitest';
import { parseId } from '@/moderation/views';
import { parseCurveId } from '@/lib/catalogue/detail';
import { parseUuid } from '@/lib/http/ids';
import { safeRedirect } from '@/lib/auth/redirect';

describe('ids in paths are read strictly', () => {
  // Number() would read all of these as integers (ECMA-262 StringToNumber).
  it.each(['0x10', '0b1', '0o7', '1e1', '+7', ' 7', '7 ', '7.0', '٣', '', '0', '-1', '2147483648', '00000000001', '9'.repeat(400)])('refuses %j', (raw) => {
    expect(() => parseId(raw)).toThrow(expect.objectContaining({ status: 404 }));
    expect(() => parseCurveId(raw)).toThrow(expect.objectContaining({ status: 404 }));
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
