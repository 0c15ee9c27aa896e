import 'server-only';
import { writeBehindBuffer } from '@/db/write-behind';
import { env } from '@/lib/server/env';
import { logger } from '@/lib/server/ops/log';

// Counters written on a read path (page loads, dial moves, an API key's last use): batched in db/write-behind.ts,
// written EVENT_FLUSH_MS after they happen, failures logged here.
const options = { flushMs: () => env().EVENT_FLUSH_MS, log: () => logger() };

export const writeBehind = () => writeBehindBuffer(options);
