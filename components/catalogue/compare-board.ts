'use client';

import { useCallback, useSyncExternalStore } from 'react';

import { MAX_COMPARE, compareHref } from '@/lib/catalogue/compare';

export { MAX_COMPARE, compareHref };
const KEY = 'bandcone.compare';
const EVENT = 'bandcone:compare';
const EMPTY: number[] = [];

let cache: { raw: string | null; ids: number[] } = { raw: null, ids: EMPTY };

function read(): number[] {
  if (typeof window === 'undefined') return EMPTY;
  const raw = window.localStorage.getItem(KEY);
  if (raw === cache.raw) return cache.ids;
  let ids: number[] = [];
  try {
    const parsed = JSON.parse(raw ?? '[]');
    if (Array.isArray(parsed)) ids = parsed.filter((n) => Number.isInteger(n) && n > 0).slice(0, MAX_COMPARE);
  } catch {
    ids = [];
  }
  cache = { raw, ids };
  return ids;
}

function write(ids: number[]) {
  window.localStorage.setItem(KEY, JSON.stringify(ids.slice(0, MAX_COMPARE)));
  window.dispatchEvent(new Event(EVENT));
}

function subscribe(fn: () => void) {
  window.addEventListener(EVENT, fn);
  window.addEventListener('storage', fn);
  return () => {
    window.removeEventListener(EVENT, fn);
    window.removeEventListener('storage', fn);
  };
}

/** The curves picked for the compare board, kept in this browser while the reader searches. */
export function useCompareBoard() {
  const ids = useSyncExternalStore(subscribe, read, () => EMPTY);
  const toggle = useCallback((id: number) => {
    const now = read();
    if (now.includes(id)) write(now.filter((x) => x !== id));
    else if (now.length < MAX_COMPARE) write([...now, id]);
  }, []);
  const replace = useCallback((next: number[]) => write(next), []);
  const clear = useCallback(() => write([]), []);
  return { ids, toggle, replace, clear, full: ids.length >= MAX_COMPARE };
}
