import { describe, expect, it } from 'vitest';
import { jsonDepthWithin, parseJsonText, readCapped, readFormCapped } from '@/lib/http/body';
import { readJson } from '@/lib/http/errors';

const status = (p: Promise<unknown>) => p.then(() => 200, (e: { status?: number }) => e.status ?? 0);

/** A request whose body arrives in `chunks` pieces of `size` bytes, with no Content-Length. */
function streamed(size: number, chunks: number, type = 'application/json') {
  let sent = 0;
  const body = new ReadableStream<Uint8Array>({
    pull(c) {
      if (sent++ >= chunks) c.close();
      else c.enqueue(new Uint8Array(size).fill(0x31));
    },
  });
  return { req: new Request('http://x/', { method: 'POST', body, headers: { 'content-type': type }, duplex: 'half' } as RequestInit), pulled: () => sent };
}

describe('bodies counted while streaming', () => {
  it('stops reading at the cap, not at the end (60 MB announced by no header)', async () => {
    const s = streamed(64 * 1024, 960);
    expect(await status(readCapped(s.req, 1024 * 1024))).toBe(413);
    expect(s.pulled()).toBeLessThan(40);
  });

  it('multipart is cut off at the cap the same way', async () => {
    const s = streamed(64 * 1024, 960, 'multipart/form-data; boundary=b');
    expect(await status(readFormCapped(s.req, 1024 * 1024))).toBe(413);
    expect(s.pulled()).toBeLessThan(40);
  });

  it('an announced length over the cap is refused before reading', async () => {
    const req = new Request('http://x/', { method: 'POST', body: 'x'.repeat(10), headers: { 'content-length': '999999999' } });
    expect(await status(readCapped(req, 1000))).toBe(413);
  });

  it('a body within the cap reads whole', async () => {
    const req = new Request('http://x/', { method: 'POST', body: JSON.stringify({ a: [1, 2, 3] }) });
    expect(await readJson(req)).toEqual({ a: [1, 2, 3] });
  });
});

describe('JSON depth', () => {
  it('counts nesting outside strings only (RFC 8259 string and escape rules)', () => {
    expect(jsonDepthWithin('[[[1]]]', 3)).toBe(true);
    expect(jsonDepthWithin('[[[[1]]]]', 3)).toBe(false);
    expect(jsonDepthWithin('{"a":"[[[[[[","b":"\\"[[[["}', 1)).toBe(true);
    expect(jsonDepthWithin('{"a":{"b":{"c":{}}}}', 3)).toBe(false);
  });

  it('refuses a million-deep body with a 400 before parsing it', () => {
    const deep = '['.repeat(1_000_000) + ']'.repeat(1_000_000);
    expect(() => parseJsonText(deep)).toThrow(/nests deeper than 32 levels/);
    expect(() => parseJsonText('{"a":')).toThrow(/not valid JSON/);
  });
});
