import { z } from 'zod';

// The Content-Security-Policy (proxy.ts) allows no eval in the browser. zod compiles its parsers
// with `new Function` when it can, and even its try-once probe is reported as a violation; the
// forms' schemas are small, so they parse without compiling.
z.config({ jitless: true });
