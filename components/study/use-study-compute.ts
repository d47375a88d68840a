'use client';

import { useEffect, useRef, useState } from 'react';
import { computeStudy, type StudyResults } from '@/lib/study/compute';
import type { StudyCurve, StudySettings } from '@/lib/study/types';

/** Long enough to let a number be typed in one go, short enough to feel live. */
const DEBOUNCE_MS = 180;

type Reply = { id: number; results?: StudyResults; error?: string; needCurves?: boolean };

/**
 * Recomputes the study when its curves or settings change: debounced, in a Web
 * Worker running the same engine code (on the main thread if workers are
 * unavailable). Replies to superseded requests are dropped.
 */
export function useStudyCompute(curves: StudyCurve[], settings: StudySettings, initial: StudyResults) {
  // Results travel with the settings they were computed for, so words and numbers never mix two studies.
  const [state, setState] = useState({ results: initial, settings });
  const setResults = (results: StudyResults, forSettings: StudySettings) => setState({ results, settings: forSettings });
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const worker = useRef<Worker | null>(null);
  const latest = useRef(0);
  const sentCurves = useRef('');
  const pending = useRef<{ id: number; curves: StudyCurve[]; settings: StudySettings; curvesKey: string } | null>(null);
  const runMain = useRef<(() => void) | null>(null);

  const curvesKey = curves.map((c) => `${c.key}:${c.points.wavelengthNm.length}`).join('|');
  const key = `${curvesKey}#${JSON.stringify(settings)}`;
  const shown = useRef<string | null>(key);

  useEffect(() => {
    let w: Worker | null = null;
    try {
      w = new Worker(new URL('./study.worker.ts', import.meta.url), { type: 'module' });
    } catch {
      w = null;
    }
    if (!w) return;
    w.onmessage = (e: MessageEvent<Reply>) => {
      const r = e.data;
      if (r.id !== latest.current) return;
      if (r.needCurves && pending.current) {
        sentCurves.current = pending.current.curvesKey;
        w!.postMessage({ ...pending.current, curves: pending.current.curves });
        return;
      }
      setBusy(false);
      if (r.results && pending.current) {
        setResults(r.results, pending.current.settings);
        setError(null);
      } else if (r.error) setError(r.error);
    };
    w.onerror = () => {
      // A worker that cannot load leaves the computation to the main thread, including the request in flight.
      worker.current = null;
      w?.terminate();
      runMain.current?.();
    };
    worker.current = w;
    return () => {
      w?.terminate();
      worker.current = null;
    };
  }, []);

  useEffect(() => {
    if (shown.current === key) return;
    shown.current = key;
    setBusy(true);
    const timer = setTimeout(() => {
      const id = ++latest.current;
      const main = () => {
        try {
          const r = computeStudy(curves, settings);
          if (id === latest.current) {
            setResults(r, settings);
            setError(null);
          }
        } catch (e) {
          setError(e instanceof Error ? e.message : String(e));
        } finally {
          if (id === latest.current) setBusy(false);
        }
      };
      runMain.current = main;
      const w = worker.current;
      if (w) {
        pending.current = { id, curves, settings, curvesKey };
        const withCurves = sentCurves.current !== curvesKey;
        if (withCurves) sentCurves.current = curvesKey;
        w.postMessage({ id, curvesKey, settings, ...(withCurves ? { curves } : {}) });
        return;
      }
      main();
    }, DEBOUNCE_MS);
    return () => clearTimeout(timer);
    // key covers curves and settings
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [key]);

  return { results: state.results, computedFor: state.settings, busy, error };
}
