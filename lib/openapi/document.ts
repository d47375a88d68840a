/**
 * The OpenAPI 3.1 document, generated from the registry (one source: the zod
 * schemas the handlers parse with). Built once per process; the registry does
 * not change at run time.
 */
import { z } from 'zod';
import { OpenAPIRegistry, OpenApiGeneratorV31 } from '@asteasolutions/zod-to-openapi';
import { API_COMPONENTS, API_OPERATIONS, type ApiOperation } from './registry';

export type OpenApiDocument = ReturnType<OpenApiGeneratorV31['generateDocument']>;

const ACCESS_TEXT: Record<ApiOperation['access'], string> = {
  public: 'Public.',
  contributor: 'Signed in (session cookie or bearer token), contributor or above.',
  moderator: 'Moderator or admin.',
  admin: 'Admin only.',
};

function register(registry: OpenAPIRegistry, op: ApiOperation) {
  const responses: Record<string, { description: string; content?: Record<string, { schema: z.ZodType }> }> = {};
  for (const [status, res] of Object.entries(op.responses)) {
    responses[status] = res.schema
      ? { description: res.description, content: { [res.type ?? 'application/json']: { schema: res.schema } } }
      : { description: res.description, ...(res.type ? { content: { [res.type]: { schema: z.string() } } } : {}) };
  }
  registry.registerPath({
    method: op.method,
    path: op.path,
    tags: [op.tag],
    summary: op.summary,
    description: [op.description, ACCESS_TEXT[op.access]].filter(Boolean).join('\n\n'),
    ...(op.access === 'public' ? {} : { security: [{ session: [] }, { bearer: [] }] }),
    request: {
      ...(op.params ? { params: op.params } : {}),
      ...(op.query ? { query: op.query } : {}),
      ...(op.body
        ? { body: { description: op.body.description, required: true, content: { [op.body.type ?? 'application/json']: { schema: op.body.schema } } } }
        : {}),
    },
    responses,
  });
}

/** Examples go where OpenAPI puts them: on each parameter and on the request body. */
function addExamples(doc: OpenApiDocument) {
  for (const op of API_OPERATIONS) {
    if (!op.example) continue;
    const target = doc.paths?.[op.path]?.[op.method];
    if (!target) continue;
    const values: Record<string, Record<string, string> | undefined> = { path: op.example.params, query: op.example.query };
    const parameters = (target.parameters ?? []) as { in: string; name: string; example?: unknown }[];
    for (const p of parameters) {
      const v = values[p.in]?.[p.name];
      if (v !== undefined) p.example = v;
    }
    const body = target.requestBody as { content?: Record<string, { example?: unknown }> } | undefined;
    if (op.example.body !== undefined && body?.content) {
      for (const media of Object.values(body.content)) media.example = op.example.body;
    }
    // Which requests the document's own test sends (tests/integration/openapi.test.ts).
    (target as Record<string, unknown>)['x-example'] = true;
  }
}

let cached: OpenApiDocument | null = null;

export function openApiDocument(): OpenApiDocument {
  if (cached) return cached;
  const registry = new OpenAPIRegistry();
  registry.registerComponent('securitySchemes', 'session', { type: 'apiKey', in: 'cookie', name: 'next-auth.session-token', description: 'The browser sign-in session.' });
  registry.registerComponent('securitySchemes', 'bearer', { type: 'http', scheme: 'bearer', description: 'An API token from /account/tokens.' });
  // Named schemas through zod's own JSON Schema output (input side: what a client sends), so no schema needs an .openapi() call.
  for (const [name, schema] of Object.entries(API_COMPONENTS)) {
    const { $schema: _ignored, ...json } = z.toJSONSchema(schema, { io: 'input', unrepresentable: 'any' });
    registry.registerComponent('schemas', name, json as never);
  }
  for (const op of API_OPERATIONS) register(registry, op);
  const doc = new OpenApiGeneratorV31(registry.definitions).generateDocument({
    openapi: '3.1.0',
    info: {
      title: 'Bandcone API',
      version: '1',
      description:
        'Measured narrowband filter curves and the light-cone model. JSON in and out unless said; wavelengths in nm (standard air), transmission as a fraction 0–1, angles in degrees. Every refusal is `{ "error": "<one sentence>", "details": [...] }` with a 4xx status. Conventions: docs/api.md in the repository.',
    },
    tags: [
      { name: 'Curves' }, { name: 'Model' }, { name: 'Optics' }, { name: 'Submissions' }, { name: 'Tokens' },
      { name: 'Account' }, { name: 'Admin' }, { name: 'Sign-in' }, { name: 'Reference' },
    ],
  });
  addExamples(doc);
  cached = doc;
  return doc;
}
