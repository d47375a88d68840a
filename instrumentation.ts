// Runs once when a server process starts.
export async function register() {
  if (process.env.NEXT_RUNTIME !== 'nodejs') return;
  // The mail queue's worker lives in the app server: it sends what requests queued, after
  // their answers, and retries while the relay is down (lib/mail/worker.ts). It waits for
  // the database by itself when it is not there yet.
  if (process.env.MAIL_WORKER !== '0') {
    import('@/lib/mail/worker').then((m) => m.startMailWorker()).catch((err) => console.error('mail worker did not start', err));
  }
  // Files a browser staged in the file store and nobody submitted are dropped after a day
  // (lib/storage/sweep.ts): a sweep shortly after start, then hourly.
  if (process.env.STAGING_SWEEP !== '0') {
    import('@/lib/storage/sweep').then((m) => m.startStagingSweeper()).catch((err) => console.error('staging sweeper did not start', err));
  }
  if (process.env.BANDCONE_WARM_CATALOGUE === '0') return;
  // The in-process copy behind fitness searches takes about a second to read at 100 000 curves;
  // reading it now, in the background, spares the first visitor that wait. A failure here only
  // means the first search reads it instead.
  // Read from where the searches will read it: the replica when there is one.
  setTimeout(() => {
    Promise.all([import('@/lib/catalogue/memory-index'), import('@/lib/catalogue/read-source')])
      .then(([m, r]) => r.readCatalogue(() => m.catalogueCopy()))
      .catch(() => undefined);
  }, 0);
}

// A page that failed because the database went away is answered 503, not 500 (lib/http/database-health.ts).
export async function onRequestError(err: unknown) {
  const { noteRequestError } = await import('@/lib/http/database-health');
  noteRequestError(err);
}
