/**
 * Pasted curves travel in a study link after the `#`: browsers never send that
 * part to a server, so a curve the reader pasted (and which Bandcone does not
 * store) reaches whoever opens the link without passing through us. The points
 * are JSON (numbers read back exactly), deflated and written as base64url.
 * What comes back is checked like any other input: a link is typed by someone.
 */

import { z } from '@/lib/schemas/zod';
import { computeMetrics } from '@/lib/engine/metrics';
import { REQUEST_LIMITS } from '@/lib/engine/limits';
import type { StudyCurve } from './types';

export const PASTED_KEY = 'pasted';
/** Links stay usable well below this; a longer curve still works in the page, just not in its link. */
export const MAX_LINK_POINTS = 20_000;

const linkedCurveSchema = z
  .object({
    label: z.string().trim().min(1).max(200),
    aoiDeg: z.number().min(REQUEST_LIMITS.measuredAoiDeg[0]).max(REQUEST_LIMITS.measuredAoiDeg[1]),
    w: z.array(z.number().positive()).min(5).max(MAX_LINK_POINTS),
    t: z.array(z.number().min(0)).min(5).max(MAX_LINK_POINTS),
  })
  .refine((c) => c.w.length === c.t.length, 'wavelength and transmission lists differ in length');
const linkedSchema = z.array(linkedCurveSchema).min(1).max(8);

function toBase64Url(bytes: Uint8Array): string {
  let s = '';
  for (let i = 0; i < bytes.length; i += 0x8000) s += String.fromCharCode(...bytes.subarray(i, i + 0x8000));
  return btoa(s).replace(/\+/g, '-').replace(/\//g, '_').replace(/=+$/, '');
}

function fromBase64Url(text: string): Uint8Array {
  const b = atob(text.replace(/-/g, '+').replace(/_/g, '/'));
  return Uint8Array.from(b, (c) => c.charCodeAt(0));
}

async function through(bytes: Uint8Array, stream: CompressionStream | DecompressionStream): Promise<Uint8Array> {
  const out = new Response(new Blob([bytes as BlobPart]).stream().pipeThrough(stream));
  return new Uint8Array(await out.arrayBuffer());
}

/** The `#…` part of a study link for these pasted curves ('' when there are none or they are too long for a link). */
export async function pastedFragment(curves: StudyCurve[]): Promise<string> {
  const pasted = curves.filter((c) => c.source === 'pasted' && c.points.wavelengthNm.length <= MAX_LINK_POINTS);
  if (pasted.length === 0) return '';
  const json = JSON.stringify(pasted.map((c) => ({ label: c.label, aoiDeg: c.aoiDeg, w: c.points.wavelengthNm, t: c.points.transmission })));
  const packed = await through(new TextEncoder().encode(json), new CompressionStream('deflate-raw'));
  return `#${PASTED_KEY}=${toBase64Url(packed)}`;
}

/** The pasted curves a link's `#…` carries; an error says what is wrong with it. */
export async function curvesFromFragment(hash: string): Promise<StudyCurve[]> {
  const params = new URLSearchParams(hash.replace(/^#/, ''));
  const packed = params.get(PASTED_KEY);
  if (!packed) return [];
  let raw: unknown;
  try {
    raw = JSON.parse(new TextDecoder().decode(await through(fromBase64Url(packed), new DecompressionStream('deflate-raw'))));
  } catch {
    throw new Error('The pasted curves in this link could not be read (the link may have been cut short).');
  }
  const parsed = linkedSchema.safeParse(raw);
  if (!parsed.success) throw new Error(`The pasted curves in this link are not usable: ${parsed.error.issues[0]?.message ?? 'unexpected content'}.`);
  return parsed.data.map((c, k) => {
    const points = { wavelengthNm: c.w, transmission: c.t };
    const m = computeMetrics(points);
    return {
      key: `p-link-${k}`,
      id: null,
      label: c.label,
      source: 'pasted' as const,
      status: null,
      lines: [],
      aoiDeg: c.aoiDeg,
      nEff: null,
      tempC: null,
      cwlNm: m.cwlNm,
      fwhmNm: m.fwhmNm,
      peakT: m.peakT,
      points,
      set: null,
    };
  });
}
