'use client';

import dynamic from 'next/dynamic';
import type { WorkbenchMode } from './submission-workbench';

// Uppy and the draft live in the browser only, so the workbench is never rendered on the server.
const Workbench = dynamic(() => import('./submission-workbench').then((m) => m.SubmissionWorkbench), {
  ssr: false,
  loading: () => <p className="rounded-card border border-dashed border-rule p-8 text-center text-sm text-muted" role="status">Loading the upload area…</p>,
});

export function WorkbenchLoader({ mode }: { mode: WorkbenchMode }) {
  return <Workbench mode={mode} />;
}
