// Loaded before the app's modules (a classic script, so it runs first). zod compiles
// object parsers with `new Function` when it may, and probes for that once; under the
// app's Content-Security-Policy (no 'unsafe-eval') the probe is refused and reported as a
// violation. zod reads this shared setting when it loads and then never tries.
globalThis.__zod_globalConfig = Object.assign(globalThis.__zod_globalConfig || {}, { jitless: true });
