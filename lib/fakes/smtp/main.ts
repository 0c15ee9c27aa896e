// Entry point: `tsx lib/fakes/smtp/main.ts`. Configured by environment:
//   FAKE_SMTP_PORT (2525), FAKE_MAILBOX_PORT (2526), FAKE_MAILBOX_DIR (.data/mailbox), FAKE_SMTP_HOST (127.0.0.1).
// The mailbox JSON API is described at the top of ./server.ts.
import { startFakeSmtp } from './server';

function port(name: string, fallback: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw === '') return fallback;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 0 || n > 65535) throw new Error(`${name} must be a port number, got "${raw}"`);
  return n;
}

async function main(): Promise<void> {
  const handle = await startFakeSmtp({
    smtpPort: port('FAKE_SMTP_PORT', 2525),
    httpPort: port('FAKE_MAILBOX_PORT', 2526),
    host: process.env.FAKE_SMTP_HOST || '127.0.0.1',
    dir: process.env.FAKE_MAILBOX_DIR || '.data/mailbox',
  });
  console.log(`[fake-smtp] SMTP on port ${handle.smtpPort}; mailbox API at ${handle.httpUrl}/messages`);
  const stop = () => {
    void handle.close().then(() => process.exit(0));
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}

main().catch((err: unknown) => {
  console.error('[fake-smtp] failed to start:', err);
  process.exit(1);
});
