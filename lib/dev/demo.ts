import path from 'node:path';
import { startStack } from '@/lib/dev/stack';
import { DEMO_PASSWORD, DEMO_PEOPLE } from '@/lib/dev/seed/demo';

// `npm run demo`: the app with its database, demo data and local fakes, on fixed local ports.
async function main(): Promise<void> {
  // Ports can be moved when several copies run on one machine (PORT, DEMO_SMTP_PORT, ...).
  const port = (name: string, fallback: number) => Number(process.env[name] ?? fallback);
  const stack = await startStack({
    dataDir: path.resolve(process.env.STOCHOS_DATA_DIR ?? '.data/demo'),
    appPort: port('PORT', 3000),
    smtpPort: port('DEMO_SMTP_PORT', 2525),
    mailboxPort: port('DEMO_MAILBOX_PORT', 2526),
    stripePort: port('DEMO_STRIPE_PORT', 12111),
    hostPagePort: port('DEMO_HOST_PORT', 4100),
    seed: true,
    // One JSON line per request would bury the sign-in table below; LOG_LEVEL=info shows them.
    extraEnv: { LOG_LEVEL: process.env.LOG_LEVEL ?? 'warn' },
  });
  const lines = [
    '',
    '  Stochos is running.',
    '',
    `  Open            ${stack.appUrl}`,
    `  Sign in at      ${stack.appUrl}/sign-in   (password for every demo person: ${DEMO_PASSWORD})`,
    ...DEMO_PEOPLE.map((p) => `    ${p.role.padEnd(8)} ${p.email.padEnd(28)} ${p.name}`),
    `  Mailbox (local) ${stack.appUrl}/dev/mailbox   every e-mail the app sends lands here`,
    ...(stack.hostPageUrl ? [`  Client portal   ${stack.hostPageUrl}   invented clients' portals (another origin), one page per client with only its own widgets`] : []),
    `  Payments        local test Stripe at ${stack.stripeUrl} (card 4242 4242 4242 4242 succeeds, 4000 0000 0000 0002 is declined)`,
    '',
    '  Press Ctrl+C to stop.',
    '',
  ];
  console.log(lines.join('\n'));
  const stop = async () => {
    await stack.stop();
    process.exit(0);
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
