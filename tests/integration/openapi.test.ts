// The API's own description against the code and the running server: every route
// handler found on disk is in /api/openapi.json with every method it exports, and
// each example request in the document gets the status and body shape it promises.
// The shape check is the same zod schema the document was generated from; the
// routes come from the filesystem, not from the registry, so a new handler
// without an entry fails here.
import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it, beforeAll } from 'vitest';
import { anonymous, json } from '../support/http';
import { API_OPERATIONS } from '@/lib/openapi/registry';

const API_DIR = path.resolve(import.meta.dirname, '../../app/api');
const HTTP_METHODS = ['GET', 'POST', 'PUT', 'PATCH', 'DELETE'] as const;

type Doc = {
  openapi: string;
  paths: Record<string, Record<string, { parameters?: { in: string; name: string; example?: string }[]; requestBody?: { content: Record<string, { example?: unknown }> }; responses: Record<string, unknown>; 'x-example'?: boolean }>>;
};

function routeFiles(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    const full = path.join(dir, e.name);
    if (e.isDirectory()) return routeFiles(full);
    return e.name === 'route.ts' ? [full] : [];
  });
}

/** app/api/curves/[id]/route.ts → /api/curves/{id}; a catch-all [...x] stays marked for prefix matching. */
function routePath(file: string): string {
  const rel = path.relative(path.resolve(API_DIR, '..'), path.dirname(file)).split(path.sep);
  return '/' + rel.map((seg) => (seg.startsWith('[...') ? '*' : seg.startsWith('[') ? `{${seg.slice(1, -1)}}` : seg)).join('/');
}

/** The HTTP methods a route module exports, read from its source. */
function exportedMethods(source: string): string[] {
  const found = new Set<string>();
  for (const m of HTTP_METHODS) {
    if (new RegExp(`export\\s+(?:const|async\\s+function|function)\\s+${m}\\b`).test(source)) found.add(m);
    if (new RegExp(`export\\s*\\{[^}]*\\bas\\s+${m}\\b`).test(source)) found.add(m);
  }
  return [...found];
}

let doc: Doc;

beforeAll(async () => {
  const res = await anonymous().fetch('/api/openapi.json');
  expect(res.status).toBe(200);
  expect(res.headers.get('content-type')).toMatch(/application\/json/);
  doc = await json<Doc>(res);
});

describe('the OpenAPI document', () => {
  it('is OpenAPI 3.1', () => {
    expect(doc.openapi).toMatch(/^3\.1\./);
    expect(Object.keys(doc.paths).length).toBeGreaterThan(20);
  });

  it('lists every route handler under app/api with every method it exports', () => {
    const files = routeFiles(API_DIR);
    expect(files.length).toBeGreaterThan(20);
    const missing: string[] = [];
    for (const file of files) {
      const route = routePath(file);
      const methods = exportedMethods(readFileSync(file, 'utf8'));
      expect(methods.length, `${route} exports no HTTP method`).toBeGreaterThan(0);
      const paths = route.endsWith('/*')
        ? Object.keys(doc.paths).filter((p) => p.startsWith(route.slice(0, -1)))
        : Object.keys(doc.paths).filter((p) => p === route);
      for (const m of methods) {
        if (!paths.some((p) => doc.paths[p][m.toLowerCase()])) missing.push(`${m} ${route}`);
      }
    }
    expect(missing, 'add these to lib/openapi/registry.ts').toEqual([]);
  });

  it('describes no route that does not exist', () => {
    const routes = routeFiles(API_DIR).map(routePath);
    const stray = Object.keys(doc.paths).filter(
      (p) => !routes.some((r) => (r.endsWith('/*') ? p.startsWith(r.slice(0, -1)) : r === p)),
    );
    expect(stray).toEqual([]);
  });

  it('gives each operation exactly one success status, and error answers the API error body', () => {
    for (const op of API_OPERATIONS) {
      const ok = Object.keys(op.responses).filter((s) => Number(s) < 400);
      expect(ok, `${op.method} ${op.path}`).toHaveLength(1);
    }
  });

  it('shows the reference page built from it', async () => {
    const res = await anonymous().fetch('/docs/api');
    expect(res.status).toBe(200);
    const html = await res.text();
    for (const p of ['/api/curves/{id}/points', '/api/model/cone', '/api/tokens']) expect(html).toContain(p);
    expect(html).toContain('/api/openapi.json');
  });
});

describe('example requests in the document', () => {
  const withExamples = API_OPERATIONS.filter((op) => op.example);

  it('cover the public reading and model routes', () => {
    expect(withExamples.length).toBeGreaterThanOrEqual(12);
  });

  for (const op of withExamples) {
    it(`${op.method.toUpperCase()} ${op.path} answers as documented`, async () => {
      const target = doc.paths[op.path][op.method];
      expect(target['x-example']).toBe(true);
      // Build the request from the document itself, not from the registry.
      let url = op.path;
      const query = new URLSearchParams();
      for (const p of target.parameters ?? []) {
        if (p.example === undefined) {
          expect(p.in, `${p.name} has no example`).not.toBe('path');
          continue;
        }
        if (p.in === 'path') url = url.replace(`{${p.name}}`, encodeURIComponent(p.example));
        else if (p.in === 'query') query.set(p.name, p.example);
      }
      const qs = query.toString();
      const media = target.requestBody ? Object.entries(target.requestBody.content)[0] : null;
      const res = await anonymous().fetch(url + (qs ? `?${qs}` : ''), {
        method: op.method.toUpperCase(),
        ...(media ? { headers: { 'content-type': media[0] }, body: JSON.stringify(media[1].example) } : {}),
      });
      const [status, documented] = Object.entries(op.responses).find(([s]) => Number(s) < 400)!;
      const text = await res.text();
      expect(res.status, text.slice(0, 300)).toBe(Number(status));
      if (documented.schema) {
        const parsed = documented.schema.safeParse(JSON.parse(text));
        expect(parsed.success, parsed.success ? '' : JSON.stringify(parsed.error.issues.slice(0, 3))).toBe(true);
      } else if (documented.type) {
        expect(res.headers.get('content-type')).toContain(documented.type);
      }
    });
  }

  it('the cone example gives the same line throughput as the model computed here', async () => {
    const op = API_OPERATIONS.find((o) => o.path === '/api/model/cone')!;
    const res = await anonymous().fetch('/api/model/cone', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(op.example!.body) });
    const body = await json<{ lines: { throughput: number; collimated: number }[] }>(res);
    // A fast obstructed cone moves part of the light onto the flank of a 3.6 nm passband: less than the collimated value.
    expect(body.lines[0].throughput).toBeLessThan(body.lines[0].collimated);
    expect(body.lines[0].throughput).toBeGreaterThan(0);
  });

  it('the n_eff example recovers the index the CWLs were computed with', async () => {
    const op = API_OPERATIONS.find((o) => o.path === '/api/model/neff')!;
    const res = await anonymous().fetch('/api/model/neff', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(op.example!.body) });
    // λ(θ) = λ0·sqrt(1 − sin²θ/n²) (thin-film angle shift, Macleod), λ0 = 656.3 nm, n = 2, rounded to 0.01 nm.
    const fit = await json<{ nEff: number; cwl0Nm: number }>(res);
    expect(fit.nEff).toBeCloseTo(2, 1);
    expect(fit.cwl0Nm).toBeCloseTo(656.3, 1);
  });
});
