'use client';

import { useEffect, useState } from 'react';

const KEY = 'bandcone:view';
export const NIGHT_VIEW_BOOT = `try{if(localStorage.getItem('${KEY}')==='night')document.documentElement.dataset.view='night'}catch(e){}`;

export function NightViewToggle() {
  const [night, setNight] = useState(false);
  const [ready, setReady] = useState(false);
  useEffect(() => {
    setNight(document.documentElement.dataset.view === 'night');
    setReady(true);
  }, []);
  function toggle() {
    const next = !night;
    setNight(next);
    if (next) document.documentElement.dataset.view = 'night';
    else delete document.documentElement.dataset.view;
    try {
      localStorage.setItem(KEY, next ? 'night' : 'day');
    } catch {
      /* private mode: the view still changes for this page */
    }
    window.dispatchEvent(new Event('bandcone:view'));
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
