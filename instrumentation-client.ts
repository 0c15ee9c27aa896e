import { z } from 'zod';

// Runs in the browser before the app's own code. zod 4 compiles object parsers with `new Function` when it may,
// and probes for that on first use; the pages' Content-Security-Policy allows no eval, so the probe would be
// reported as a violation on every page. Interpreted parsing is as correct and fast enough in forms.
z.config({ jitless: true });
