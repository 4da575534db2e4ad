import { config } from "zod";

// Runs in the browser before the app does. zod compiles object schemas with `new Function` when it
// can, and probes for that once; under our Content Security Policy (no 'unsafe-eval') the probe
// itself is reported as a violation. Interpreted parsing is fast enough for the forms' few fields.
config({ jitless: true });
