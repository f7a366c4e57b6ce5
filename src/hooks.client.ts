import { z } from 'zod';

// zod compiles object schemas with `new Function` when the page allows it; the app's
// Content-Security-Policy does not (no 'unsafe-eval'), and zod's probe for it would show up as a
// policy violation in every browser console: parse without compiling (same results)
z.config({ jitless: true });
