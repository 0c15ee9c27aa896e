import { isIP } from 'node:net';
import { z } from 'zod';

// Environment is read and validated once; every module imports `env()` from here.
const boolish = z
  .enum(['1', '0', 'true', 'false', ''])
  .optional()
  .transform((v) => v === '1' || v === 'true');

const schema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  APP_URL: z.url().default('http://localhost:3000'),
  AUTH_SECRET: z.string().min(32).optional(),
  STOCHOS_DEMO: boolish,
  DATABASE_FILE: z.string().min(1).default('.data/stochos.sqlite'),
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
  STRIPE_WEBHOOK_SECRET: z.string().default('whsec_stochos_local_fake_secret'),
  STRIPE_PRICE_ID: z.string().optional(),
  FAKE_STRIPE_URL: z.url().default('http://127.0.0.1:12111'),
  EMBED_SIGNING_SECRET: z.string().min(32).optional(),
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
  // Structured JSON logs (pino) on stdout; 'silent' turns them off.
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
  // Page loads and dial moves are written in batches, at most this long after they happen.
  EVENT_FLUSH_MS: z.coerce.number().int().min(10).max(60_000).default(250),
});

export type Env = z.infer<typeof schema> & { authSecret: string; realSmtp: boolean; embedSecret: string };

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
  if (!e.AUTH_SECRET && e.NODE_ENV === 'production' && !e.STOCHOS_DEMO) {
    throw new Error('Invalid environment:\n  AUTH_SECRET: required in production (32 characters or more)');
  }
  const authSecret = e.AUTH_SECRET ?? DEV_SECRET;
  cached = {
    ...e,
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
