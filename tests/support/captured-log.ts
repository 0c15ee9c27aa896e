import { afterAll, beforeAll } from 'vitest';
import { Writable } from 'node:stream';
import pino from 'pino';

/**
 * Swaps the server's logger (lib/server/ops/log.ts keeps it on globalThis) for one that collects each JSON line,
 * for the test file that calls it; the real logger comes back after the file.
 */
export function captureLog(): Record<string, unknown>[] {
  const lines: Record<string, unknown>[] = [];
  const g = globalThis as unknown as { __stochosLog?: pino.Logger };
  let saved: pino.Logger | undefined;
  beforeAll(() => {
    saved = g.__stochosLog;
    const sink = new Writable({ write: (chunk, _enc, cb) => (lines.push(JSON.parse(String(chunk))), cb()) });
    g.__stochosLog = pino({ level: 'info', formatters: { level: (label) => ({ level: label }) } }, sink);
  });
  afterAll(() => {
    g.__stochosLog = saved;
  });
  return lines;
}
