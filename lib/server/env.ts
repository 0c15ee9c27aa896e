import { isIP } from 'node:net';
import { z } from 'zod';
import { databaseEnvShape } from '@/db/config';

// Environment is read and validated once; every module imports `env()` from here.
const boolish = z
  .enum(['1', '0', 'true', 'false', ''])
  .optional()
  .transform((v) => v === '1' || v === 'true');

const schema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  APP_URL: z.url().default('http://localhost:3000'),
  // next-auth reads it; when set it must name the same origin as APP_URL.
  NEXTAUTH_URL: z.url().optional(),
  AUTH_SECRET: z.string().min(32).optional(),
  STOCHOS_DEMO: boolish,
  ...databaseEnvShape,
  SESSION_MAX_AGE_SECONDS: z.coerce.number().int().min(300).max(86_400).default(8 * 3600),
  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: z.coerce.number().int().min(1).max(65_535).default(2525),
  SMTP_USER: z.string().optional(),
  SMTP_PASS: z.string().optional(),
  SMTP_SECURE: boolish,
  MAIL_FROM: z.string().default('Stochos <no-reply@stochos.local>'),
  // The development mailbox reads the local SMTP fake; it is off whenever a real relay is configured.
  FAKE_MAILBOX_URL: z.url().default('http://127.0.0.1:2526'),
  STRIPE_SECRET_KEY: z.string().optional(),
  // Required with a real STRIPE_SECRET_KEY; only the local fake falls back to its own known secret.
  STRIPE_WEBHOOK_SECRET: z.string().min(1).optional(),
  STRIPE_PRICE_ID: z.string().optional(),
  FAKE_STRIPE_URL: z.url().default('http://127.0.0.1:12111'),
  EMBED_SIGNING_SECRET: z.string().min(32).optional(),
  // Structured JSON logs (pino) on stdout; 'silent' turns them off.
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
  // Page loads and dial moves are written in batches, at most this long after they happen.
  EVENT_FLUSH_MS: z.coerce.number().int().min(10).max(60_000).default(250),
  // E-mails one client address may trigger per hour (sign-in links, password resets, sign-ups together).
  MAIL_LIMIT_PER_CLIENT_HOUR: z.coerce.number().int().min(1).max(1_000_000).default(30),
  // Reverse proxies whose forwarded header is believed (IPs or CIDRs, comma-separated); empty: the socket peer only.
  TRUSTED_PROXIES: z
    .string()
    .default('')
    .superRefine((list, ctx) => {
      for (const entry of list.split(/[\s,]+/).filter(Boolean)) {
        const [addr, bits, extra] = entry.split('/');
        const v = isIP(addr ?? '');
        const max = v === 6 ? 128 : 32;
        if (!v || extra !== undefined || (bits !== undefined && (!/^\d+$/.test(bits) || Number(bits) > max))) {
          ctx.addIssue({ code: 'custom', message: `"${entry}" is not an IP address or CIDR range (e.g. 10.0.0.0/8, 192.0.2.7, ::1)` });
        }
      }
    }),
  TRUSTED_PROXY_HEADER: z.enum(['x-forwarded-for', 'forwarded']).default('x-forwarded-for'),
});

export type Env = Omit<z.infer<typeof schema>, 'STRIPE_WEBHOOK_SECRET'> & { STRIPE_WEBHOOK_SECRET: string; authSecret: string; realSmtp: boolean; embedSecret: string };

/** The test key the local Stripe fake accepts; any other STRIPE_SECRET_KEY is treated as real. */
export const FAKE_STRIPE_KEY = 'sk_test_local_fake';
const FAKE_WEBHOOK_SECRET = 'whsec_stochos_local_fake_secret';

const LOOPBACK_HOSTS = new Set(['localhost', '127.0.0.1', '[::1]']);
export const isLoopbackHost = (hostname: string): boolean => LOOPBACK_HOSTS.has(hostname.toLowerCase());

let cached: Env | null = null;

const DEV_SECRET = 'stochos-development-secret-not-for-production-use';

export function env(): Env {
  if (cached) return cached;
  const parsed = schema.safeParse(process.env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`).join('\n');
    throw new Error(`Invalid environment:\n${lines}`);
  }
  const e = parsed.data;
  const problems: string[] = [];
  // `next build` runs with NODE_ENV=production but serves nobody: the checks below are for a running server.
  const production = e.NODE_ENV === 'production' && process.env.NEXT_PHASE !== 'phase-production-build';
  if (production && !e.AUTH_SECRET) {
    problems.push('AUTH_SECRET: required in production, with or without STOCHOS_DEMO (32 characters or more, e.g. from `openssl rand -base64 32`)');
  }
  const app = new URL(e.APP_URL);
  if (!['http:', 'https:'].includes(app.protocol)) problems.push('APP_URL: use an http:// or https:// address');
  else if (production && app.protocol !== 'https:' && !(e.STOCHOS_DEMO && isLoopbackHost(app.hostname))) {
    problems.push('APP_URL: must start with https:// in production so session cookies are Secure (plain http only for the local demo on localhost or 127.0.0.1)');
  }
  // A NEXTAUTH_URL this function filled in itself (below) follows APP_URL; only one set by the operator is checked.
  const givenNextAuthUrl = e.NEXTAUTH_URL && e.NEXTAUTH_URL !== process.env.STOCHOS_FILLED_NEXTAUTH_URL ? e.NEXTAUTH_URL : undefined;
  if (givenNextAuthUrl && new URL(givenNextAuthUrl).origin !== app.origin) problems.push(`NEXTAUTH_URL: must have the same origin as APP_URL (${app.origin}), or be left unset`);
  const realStripe = Boolean(e.STRIPE_SECRET_KEY) && e.STRIPE_SECRET_KEY !== FAKE_STRIPE_KEY;
  if (realStripe && !e.STRIPE_WEBHOOK_SECRET) {
    problems.push('STRIPE_WEBHOOK_SECRET: required with a real STRIPE_SECRET_KEY (the signing secret, whsec_..., of your Stripe webhook endpoint)');
  }
  if (problems.length) throw new Error(`Invalid environment:\n${problems.map((p) => `  ${p}`).join('\n')}`);
  // next-auth takes its own URL (and so the Secure flag of its cookies) from NEXTAUTH_URL.
  if (!givenNextAuthUrl) {
    process.env.NEXTAUTH_URL = app.origin;
    process.env.STOCHOS_FILLED_NEXTAUTH_URL = app.origin;
  }
  const authSecret = e.AUTH_SECRET ?? DEV_SECRET;
  cached = {
    ...e,
    STRIPE_WEBHOOK_SECRET: e.STRIPE_WEBHOOK_SECRET ?? FAKE_WEBHOOK_SECRET,
    authSecret,
    embedSecret: e.EMBED_SIGNING_SECRET ?? `${authSecret}:embed`,
    realSmtp: Boolean(e.SMTP_USER) || !['127.0.0.1', 'localhost'].includes(e.SMTP_HOST),
  };
  return cached;
}

/** Tests change the environment between files. */
export function resetEnvCache(): void {
  cached = null;
}
