// Runs the cone study off the main thread so typing never waits for the engine.
import { computeStudy } from '@/lib/study/compute';
import type { StudyCurve, StudySettings } from '@/lib/study/types';

type Request = { id: number; curvesKey: string; curves?: StudyCurve[]; settings: StudySettings };

const scope = self as unknown as { onmessage: ((e: MessageEvent<Request>) => void) | null; postMessage: (m: unknown) => void };
let curves: StudyCurve[] = [];
let curvesKey = '';

scope.onmessage = (e) => {
  const msg = e.data;
  if (msg.curves) {
    curves = msg.curves;
    curvesKey = msg.curvesKey;
  }
  if (msg.curvesKey !== curvesKey) {
    scope.postMessage({ id: msg.id, needCurves: true });
    return;
  }
  try {
    scope.postMessage({ id: msg.id, results: computeStudy(curves, msg.settings) });
  } catch (err) {
    scope.postMessage({ id: msg.id, error: err instanceof Error ? err.message : String(err) });
  }
};
