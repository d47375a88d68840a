/**
 * Turns the generated document into what the reference page shows: operations
 * grouped by tag, each schema flattened into rows of (field, type, limits).
 * Pure, so the page stays a plain server component.
 */
import type { OpenApiDocument } from './document';

type Json = Record<string, unknown>;

export interface FieldRow {
  /** Dotted path, e.g. optic.fNumber or lines[]. */
  name: string;
  type: string;
  required: boolean;
  notes: string;
}

export interface ParameterRow extends FieldRow {
  in: string;
  example?: string;
}

export interface ReadOperation {
  method: string;
  path: string;
  anchor: string;
  summary: string;
  description: string;
  parameters: ParameterRow[];
  body: { type: string; description: string; fields: FieldRow[]; example?: string } | null;
  responses: { status: string; description: string; type: string | null; fields: FieldRow[] }[];
  hasExample: boolean;
}

export interface ReadTag {
  name: string;
  operations: ReadOperation[];
}

const METHOD_ORDER = ['get', 'post', 'patch', 'put', 'delete'];
const MAX_DEPTH = 4;

function resolve(doc: OpenApiDocument, schema: Json | undefined): Json {
  if (!schema) return {};
  const ref = schema.$ref;
  if (typeof ref === 'string' && ref.startsWith('#/components/schemas/')) {
    const name = ref.slice('#/components/schemas/'.length);
    return { ...((doc.components?.schemas?.[name] as Json | undefined) ?? {}), title: name };
  }
  return schema;
}

function typeName(doc: OpenApiDocument, s: Json): string {
  const r = resolve(doc, s);
  if (Array.isArray(r.enum)) return r.enum.map((v) => JSON.stringify(v)).join(' | ');
  if ('const' in r) return JSON.stringify(r.const);
  const variants = (r.anyOf ?? r.oneOf) as Json[] | undefined;
  if (variants) return variants.map((v) => typeName(doc, v)).join(' | ');
  const t = r.type;
  const types = Array.isArray(t) ? t : t ? [t] : [];
  if (types.includes('array')) {
    const items = typeName(doc, (r.items as Json) ?? {});
    return `array of ${items}${types.includes('null') ? ' | null' : ''}`;
  }
  if (types.length) return types.join(' | ');
  if (r.properties) return 'object';
  return 'any';
}

function limits(s: Json): string {
  const parts: string[] = [];
  const range = (lo: unknown, hi: unknown, exLo: unknown, exHi: unknown) => {
    if (lo !== undefined) parts.push(`≥ ${lo}`);
    if (exLo !== undefined) parts.push(`> ${exLo}`);
    if (hi !== undefined) parts.push(`≤ ${hi}`);
    if (exHi !== undefined) parts.push(`< ${exHi}`);
  };
  range(s.minimum, s.maximum, s.exclusiveMinimum, s.exclusiveMaximum);
  if (s.minLength !== undefined || s.maxLength !== undefined) parts.push(`${s.minLength ?? 0}–${s.maxLength ?? '∞'} characters`);
  if (s.minItems !== undefined || s.maxItems !== undefined) parts.push(`${s.minItems ?? 0}–${s.maxItems ?? '∞'} items`);
  if (s.default !== undefined) parts.push(`default ${JSON.stringify(s.default)}`);
  if (typeof s.description === 'string') parts.push(s.description);
  return parts.join('; ');
}

/** Rows for every field of an object schema, nested objects and arrays of objects flattened with dotted names. */
export function fieldRows(doc: OpenApiDocument, schema: Json | undefined, prefix = '', depth = 0): FieldRow[] {
  const s = resolve(doc, schema);
  const props = s.properties as Record<string, Json> | undefined;
  if (!props || depth > MAX_DEPTH) return [];
  const required = new Set((s.required as string[] | undefined) ?? []);
  const rows: FieldRow[] = [];
  for (const [key, raw] of Object.entries(props)) {
    const p = resolve(doc, raw);
    const name = prefix + key;
    rows.push({ name, type: typeName(doc, p), required: required.has(key), notes: limits(p) });
    if (p.properties) rows.push(...fieldRows(doc, p, `${name}.`, depth + 1));
    const items = p.items ? resolve(doc, p.items as Json) : null;
    if (items?.properties) rows.push(...fieldRows(doc, items, `${name}[].`, depth + 1));
  }
  return rows;
}

export function anchorFor(method: string, path: string): string {
  return `${method}-${path.replace(/^\/api\//, '').split(/[^A-Za-z0-9]+/).filter(Boolean).join('-')}`;
}

/** The document as the reference page reads it: tags in document order, operations by path then method. */
export function readDocument(doc: OpenApiDocument): ReadTag[] {
  const byTag = new Map<string, ReadOperation[]>((doc.tags ?? []).map((t) => [t.name, []]));
  for (const [path, item] of Object.entries(doc.paths ?? {})) {
    for (const method of METHOD_ORDER) {
      const op = (item as Record<string, Json | undefined>)[method];
      if (!op) continue;
      const parameters = ((op.parameters as Json[] | undefined) ?? []).map((p) => {
        const schema = resolve(doc, p.schema as Json);
        return {
          name: String(p.name),
          in: String(p.in),
          type: typeName(doc, schema),
          required: p.required === true,
          notes: limits({ ...schema, description: p.description ?? schema.description }),
          example: p.example === undefined ? undefined : String(p.example),
        };
      });
      const rb = op.requestBody as { description?: string; content?: Record<string, { schema?: Json; example?: unknown }> } | undefined;
      const [bodyType, bodyMedia] = rb?.content ? Object.entries(rb.content)[0] : [null, null];
      const body = bodyType && bodyMedia
        ? {
            type: bodyType,
            description: rb?.description ?? '',
            fields: fieldRows(doc, bodyMedia.schema),
            example: bodyMedia.example === undefined ? undefined : JSON.stringify(bodyMedia.example, null, 1),
          }
        : null;
      const responses = Object.entries((op.responses as Record<string, { description?: string; content?: Record<string, { schema?: Json }> }>) ?? {}).map(
        ([status, res]) => {
          const [type, media] = res.content ? Object.entries(res.content)[0] : [null, null];
          const ok = status.startsWith('2');
          return { status, description: res.description ?? '', type, fields: ok && media?.schema ? fieldRows(doc, media.schema) : [] };
        },
      );
      const tag = ((op.tags as string[] | undefined) ?? ['Other'])[0];
      if (!byTag.has(tag)) byTag.set(tag, []);
      byTag.get(tag)!.push({
        method,
        path,
        anchor: anchorFor(method, path),
        summary: String(op.summary ?? ''),
        description: String(op.description ?? ''),
        parameters,
        body,
        responses,
        hasExample: op['x-example'] === true,
      });
    }
  }
  return [...byTag].filter(([, ops]) => ops.length).map(([name, operations]) => ({ name, operations }));
}
