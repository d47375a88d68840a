'use client';

import { useState } from 'react';
import Link from 'next/link';
import { MAX_COMPARE, compareHref, useCompareBoard } from './compare-board';

export function AddToCompare({ id }: { id: number }) {
  const board = useCompareBoard();
  const on = board.ids.includes(id);
  return (
    <span className="inline-flex items-center gap-2">
      <button
        type="button"
        onClick={() => board.toggle(id)}
        disabled={!on && board.full}
        className={`rounded-card border px-3 py-1.5 text-sm ${on ? 'border-accent bg-accent/10' : 'border-rule bg-panel hover:border-accent'} disabled:opacity-50`}
        aria-pressed={on}
        data-testid="add-to-compare"
        title={!on && board.full ? `The board holds ${MAX_COMPARE} curves` : undefined}
      >
        {on ? '✓ On the compare board' : 'Add to compare board'}
      </button>
      {board.ids.length ? (
        <Link href={compareHref(board.ids)} className="text-sm text-accent underline-offset-4 hover:underline">
          Open board ({board.ids.length})
        </Link>
      ) : null}
    </span>
  );
}

export function CopyText({ text, label = 'Copy' }: { text: string; label?: string }) {
  const [done, setDone] = useState(false);
  return (
    <button
      type="button"
      className="rounded-card border border-rule px-2 py-0.5 text-xs hover:border-accent"
      onClick={async () => {
        try {
          await navigator.clipboard.writeText(text);
          setDone(true);
          setTimeout(() => setDone(false), 1500);
        } catch {
          setDone(false);
        }
      }}
    >
      {done ? 'Copied' : label}
    </button>
  );
}
