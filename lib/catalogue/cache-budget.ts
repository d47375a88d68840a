// The memory the catalogue copy may spend on cached fitness blocks, in MB. BANDCONE_FITNESS_CACHE_MB
// overrides it; a server of several processes (WEB_CONCURRENCY) shares it out among them.
export const DEFAULT_FITNESS_CACHE_MB = 160;

export function fitnessCacheBytes(env: Record<string, string | undefined> = process.env): number {
  const mb = Number(env.BANDCONE_FITNESS_CACHE_MB ?? DEFAULT_FITNESS_CACHE_MB);
  return (Number.isFinite(mb) && mb >= 0 ? mb : DEFAULT_FITNESS_CACHE_MB) * 1024 * 1024;
}
