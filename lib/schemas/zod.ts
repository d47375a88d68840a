import { z } from 'zod';

// The pages' Content-Security-Policy (lib/http/security-headers.ts) forbids eval, and zod
// probes for it with `new Function('')` when its first object schema is built, which the
// browser reports as a violation. In the browser, schemas run interpreted; the server keeps
// zod's compiled fast path. Every schema module imports `z` from here so this runs first.
if (typeof window !== 'undefined') z.config({ jitless: true });

export { z };
