'use client';

import { useSyncExternalStore } from 'react';

const KEY = 'bandcone:view';
const EVENT = 'bandcone:view';
export const NIGHT_VIEW_BOOT = `try{if(localStorage.getItem('${KEY}')==='night')document.documentElement.dataset.view='night'}catch(e){}`;

function subscribe(onChange: () => void) {
  window.addEventListener(EVENT, onChange);
  return () => window.removeEventListener(EVENT, onChange);
}
const isNight = () => document.documentElement.dataset.view === 'night';
const noop = () => () => {};

export function NightViewToggle() {
  const night = useSyncExternalStore(subscribe, isNight, () => false);
  // True only once hydrated, so tests (and impatient fingers) never click a dead button.
  const ready = useSyncExternalStore(noop, () => true, () => false);
  function toggle() {
    const next = !night;
    if (next) document.documentElement.dataset.view = 'night';
    else delete document.documentElement.dataset.view;
    try {
      localStorage.setItem(KEY, next ? 'night' : 'day');
    } catch {
      /* private mode: the view still changes for this page */
    }
    window.dispatchEvent(new Event(EVENT));
  }
  return (
    <button
      type="button"
      onClick={toggle}
      aria-pressed={night}
      data-ready={ready || undefined}
      className="rounded-card border border-rule px-2 py-1 text-sm hover:border-accent"
      title="Dim red on black, for use at the telescope"
    >
      {night ? 'Day view' : 'Night view'}
    </button>
  );
}
