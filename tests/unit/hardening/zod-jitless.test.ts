import { afterEach, describe, expect, it, vi } from 'vitest';

// instrumentation-client.ts turns zod's compiled parsers off without importing zod (so pages that never parse carry
// no zod). Checked here against zod itself: with the setting, parsing an object never constructs a Function (the
// probe a Content-Security-Policy without 'unsafe-eval' would report); without it, zod does.
const g = globalThis as { __zod_globalConfig?: Record<string, unknown>; Function: FunctionConstructor };
const RealFunction = g.Function;

async function functionsBuiltWhileParsing(): Promise<number> {
  const { z } = await import('zod');
  let built = 0;
  g.Function = new Proxy(RealFunction, {
    construct(target, args) {
      built++;
      return Reflect.construct(target, args);
    },
  });
  try {
    // A new schema each time: zod compiles per schema, on its first parse.
    const schema = z.object({ a: z.number(), b: z.string().optional() });
    for (let i = 0; i < 3; i++) expect(schema.parse({ a: i, b: 'x' })).toEqual({ a: i, b: 'x' });
  } finally {
    g.Function = RealFunction;
  }
  return built;
}

// zod is loaded once for this file and keeps the settings object it found (or made) on globalThis; the
// instrumentation sets a key on that same object, whichever of the two ran first.
describe('zod in the browser pages', () => {
  afterEach(() => {
    if (g.__zod_globalConfig) delete g.__zod_globalConfig.jitless;
  });

  it('builds functions to parse when nothing sets jitless (so the check below can fail)', async () => {
    expect(await functionsBuiltWhileParsing()).toBeGreaterThan(0);
  });

  it('builds none after instrumentation-client.ts ran', async () => {
    const { z } = await import('zod');
    expect(z.config().jitless).toBeUndefined();
    vi.resetModules();
    await import('@/instrumentation-client');
    expect(z.config().jitless).toBe(true);
    expect(await functionsBuiltWhileParsing()).toBe(0);
  });
});
