import 'server-only';
import pino, { type Logger } from 'pino';
import { env } from '@/lib/server/env';

// One structured JSON logger for the server (pino, one line per event on stdout). Request handlers log through
// a child carrying the request id (lib/server/http/handler.ts), so every line of one request can be found together.

const g = globalThis as unknown as { __stochosLog?: Logger };

export function logger(): Logger {
  g.__stochosLog ??= pino({
    level: env().LOG_LEVEL,
    base: { app: 'stochos', pid: process.pid },
    timestamp: pino.stdTimeFunctions.isoTime,
    formatters: { level: (label) => ({ level: label }) },
    // Never write credentials into logs, wherever they turn up.
    redact: { paths: ['authorization', 'cookie', 'password', 'pass', 'token', '*.authorization', '*.cookie', '*.password', '*.pass', '*.token'], censor: '[redacted]' },
  });
  return g.__stochosLog;
}
