// Runs in the browser before the app's own code, on every page (the embed too), so it must not import zod: that
// would put the whole library into pages that never parse anything. zod 4 compiles object parsers with
// `new Function` when it may, and probes for that on first use; the pages' Content-Security-Policy allows no eval,
// so the probe would be reported as a violation. zod keeps its settings in `globalThis.__zod_globalConfig` (shared
// by every copy, read when a parser first runs): setting `jitless` there is what `z.config({ jitless: true })` does.
// Interpreted parsing is as correct and fast enough in forms. tests/unit/hardening/zod-jitless.test.ts checks it.
const g = globalThis as { __zod_globalConfig?: { jitless?: boolean } };
(g.__zod_globalConfig ??= {}).jitless = true;
export {};
