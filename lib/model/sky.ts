import 'server-only';
import { currentActor } from '@/lib/auth/actor';
import { loadReadableSamples } from '@/lib/catalogue/points';
import type { SkyRequest } from '@/lib/engine/sky';
import type { z } from 'zod';
import type { skyRequestSchema } from '@/lib/schemas/model';
import { formatCurveId } from '@/lib/labels';

/** A reference curve named by id becomes its points (readable curves only), measured AOI and label. */
export async function resolveSkyReference(req: Request, sky: z.infer<typeof skyRequestSchema>): Promise<SkyRequest> {
  const ref = sky.reference;
  if (!ref || !('curveId' in ref)) return { model: sky.model, reference: ref };
  const curve = await loadReadableSamples(await currentActor(req), ref.curveId);
  return {
    model: sky.model,
    reference: { points: curve.points, measuredAoiDeg: curve.aoiDeg, label: `curve ${formatCurveId(curve.id)}` },
  };
}
