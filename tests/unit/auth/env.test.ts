import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { env, resetEnvCache } from '@/lib/server/env';
import { dataFolderSecret } from '@/lib/dev/stack';

const KEYS = ['NODE_ENV', 'APP_URL', 'NEXTAUTH_URL', 'STOCHOS_FILLED_NEXTAUTH_URL', 'AUTH_SECRET', 'STOCHOS_DEMO', 'STRIPE_SECRET_KEY', 'STRIPE_WEBHOOK_SECRET', 'NEXT_PHASE'] as const;
let saved: Record<string, string | undefined>;
const SECRET = 'a-real-secret-of-at-least-32-characters!!';

function setEnv(v: Partial<Record<(typeof KEYS)[number], string>>): void {
  for (const k of KEYS) delete process.env[k];
  Object.assign(process.env, v);
  resetEnvCache();
}

beforeEach(() => {
  saved = Object.fromEntries(KEYS.map((k) => [k, process.env[k]]));
});
afterEach(() => {
  for (const k of KEYS) {
    if (saved[k] === undefined) delete process.env[k];
    else (process.env as Record<string, string | undefined>)[k] = saved[k];
  }
  resetEnvCache();
});

describe('secrets and URLs at start-up', () => {
  it('production refuses to start without AUTH_SECRET, with or without the demo flag', () => {
    setEnv({ NODE_ENV: 'production', APP_URL: 'https://stochos.example' });
    expect(() => env()).toThrow(/AUTH_SECRET: required in production/);
    setEnv({ NODE_ENV: 'production', STOCHOS_DEMO: '1', APP_URL: 'http://localhost:3000' });
    expect(() => env()).toThrow(/AUTH_SECRET: required in production/);
    setEnv({ NODE_ENV: 'production', STOCHOS_DEMO: '1', APP_URL: 'http://localhost:3000', AUTH_SECRET: SECRET });
    expect(env().authSecret).toBe(SECRET);
  });

  it('a production build (no server) needs no secret', () => {
    setEnv({ NODE_ENV: 'production', NEXT_PHASE: 'phase-production-build' });
    expect(() => env()).not.toThrow();
  });

  it('production needs an https APP_URL, except the local demo on loopback', () => {
    setEnv({ NODE_ENV: 'production', APP_URL: 'http://stochos.example', AUTH_SECRET: SECRET });
    expect(() => env()).toThrow(/APP_URL: must start with https:\/\//);
    setEnv({ NODE_ENV: 'production', APP_URL: 'http://stochos.example', AUTH_SECRET: SECRET, STOCHOS_DEMO: '1' });
    expect(() => env()).toThrow(/APP_URL: must start with https:\/\//);
    setEnv({ NODE_ENV: 'production', APP_URL: 'http://localhost:3000', AUTH_SECRET: SECRET });
    expect(() => env()).toThrow(/APP_URL/);
    setEnv({ NODE_ENV: 'production', APP_URL: 'http://127.0.0.1:3000', AUTH_SECRET: SECRET, STOCHOS_DEMO: '1' });
    expect(() => env()).not.toThrow();
    setEnv({ NODE_ENV: 'production', APP_URL: 'https://stochos.example', AUTH_SECRET: SECRET });
    expect(env().APP_URL).toBe('https://stochos.example');
    // next-auth takes the Secure flag of its cookies from NEXTAUTH_URL.
    expect(process.env.NEXTAUTH_URL).toBe('https://stochos.example');
  });

  it('NEXTAUTH_URL must name the same origin as APP_URL', () => {
    setEnv({ NODE_ENV: 'production', APP_URL: 'https://stochos.example', NEXTAUTH_URL: 'http://stochos.example', AUTH_SECRET: SECRET });
    expect(() => env()).toThrow(/NEXTAUTH_URL: must have the same origin as APP_URL/);
  });

  it('a real Stripe key without STRIPE_WEBHOOK_SECRET stops start-up; the fake keeps its own secret', () => {
    setEnv({ STRIPE_SECRET_KEY: 'sk_live_example_not_a_real_key' });
    expect(() => env()).toThrow(/STRIPE_WEBHOOK_SECRET: required with a real STRIPE_SECRET_KEY/);
    setEnv({ STRIPE_SECRET_KEY: 'sk_live_example_not_a_real_key', STRIPE_WEBHOOK_SECRET: 'whsec_operator_secret' });
    expect(env().STRIPE_WEBHOOK_SECRET).toBe('whsec_operator_secret');
    setEnv({});
    expect(env().STRIPE_WEBHOOK_SECRET).toBe('whsec_stochos_local_fake_secret');
  });
});

describe('the demo’s secret', () => {
  it('is random per data folder and kept there, readable by its owner only', () => {
    const a = fs.mkdtempSync(path.join(os.tmpdir(), 'secret-a-'));
    const b = fs.mkdtempSync(path.join(os.tmpdir(), 'secret-b-'));
    try {
      const first = dataFolderSecret(a);
      expect(first.length).toBeGreaterThanOrEqual(32);
      expect(dataFolderSecret(a)).toBe(first);
      expect(dataFolderSecret(b)).not.toBe(first);
      expect(fs.statSync(path.join(a, 'auth-secret')).mode & 0o077).toBe(0);
    } finally {
      fs.rmSync(a, { recursive: true, force: true });
      fs.rmSync(b, { recursive: true, force: true });
    }
  });
});
