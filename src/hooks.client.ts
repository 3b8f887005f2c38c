// The browser runs under a Content-Security-Policy without 'unsafe-eval' (svelte.config.js). zod 4
// probes for eval with `new Function` the first time it builds an object parser, which the policy
// reports as a violation; jitless mode skips the probe and the compiled fast path (the interpreted
// parser gives the same results).
import { z } from 'zod';

z.config({ jitless: true });
