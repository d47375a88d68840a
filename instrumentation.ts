// Runs once when a server process starts.
export async function register() {
  if (process.env.NEXT_RUNTIME !== 'nodejs' || process.env.BANDCONE_WARM_CATALOGUE === '0') return;
  // The in-process copy behind fitness searches takes about a second to read at 100 000 curves;
  // reading it now, in the background, spares the first visitor that wait. A failure here only
  // means the first search reads it instead.
  setTimeout(() => {
    import('@/lib/catalogue/memory-index').then((m) => m.catalogueCopy()).catch(() => undefined);
  }, 0);
}
