/**
 * The preview of a read curve (POST /api/curves/preview): its derived numbers and
 * the automatic checks, stored nowhere. Pure, so the handler stays thin and the
 * browser can take the answer's type from here.
 */
import { computeMetrics } from './metrics';
import { runChecks, type CheckMetadata } from './checks';
import type { Check, CurvePoints, Metrics } from './types';
import type { ReadAssumptions } from './reader/types';

export type PreviewAnswer = {
  points: CurvePoints;
  assumed: ReadAssumptions | null;
  metrics: Omit<Metrics, 'warnings'>;
  checks: Check[];
  warnings: string[];
};

export function previewOf(read: { points: CurvePoints; assumed?: ReadAssumptions; warnings: string[] }, metadata: CheckMetadata | undefined): PreviewAnswer {
  const metrics = computeMetrics(read.points);
  const checks = runChecks({ metrics, metadata });
  const { warnings: metricWarnings, sampleCount, medianStepNm, rangeNm, ...rest } = metrics;
  return {
    points: read.points,
    assumed: read.assumed ?? null,
    metrics: { ...rest, rangeNm, sampleCount, medianStepNm },
    checks,
    warnings: [...read.warnings, ...metricWarnings],
  };
}
