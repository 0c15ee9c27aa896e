import { describe, it, expect, inject } from 'vitest';
import { spawn } from 'node:child_process';
import os from 'node:os';
import path from 'node:path';
import fs from 'node:fs';

// Start-up refuses unsafe settings (issue 13): the production build, started the way an operator starts it.
const OFF = Number(process.env.TEST_PORT_OFFSET ?? 0);
const PORT = 3190 + OFF;

function start(extra: Record<string, string>): Promise<{ code: number | null; output: string }> {
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'stochos-startup-'));
  const env: NodeJS.ProcessEnv = { PATH: process.env.PATH, NODE_ENV: 'production', NEXT_TELEMETRY_DISABLED: '1', DATABASE_FILE: path.join(dataDir, 'db.sqlite'), ...extra };
  return new Promise((resolve) => {
    const child = spawn(process.execPath, [path.resolve('node_modules/next/dist/bin/next'), 'start', '-H', '127.0.0.1', '-p', String(PORT)], { env, stdio: ['ignore', 'pipe', 'pipe'] });
    let output = '';
    child.stdout.on('data', (d) => (output += d));
    child.stderr.on('data', (d) => (output += d));
    // A server that did start is stopped after a while; the test then fails on the exit code.
    const timer = setTimeout(() => child.kill('SIGTERM'), 30_000);
    child.on('exit', (code) => {
      clearTimeout(timer);
      fs.rmSync(dataDir, { recursive: true, force: true });
      resolve({ code, output });
    });
  });
}

const SECRET = 'startup-test-secret-of-more-than-32-characters';

describe('start-up', () => {
  it('refuses to start in production without AUTH_SECRET, even as the demo', async () => {
    const r = await start({ STOCHOS_DEMO: '1', APP_URL: `http://localhost:${PORT}` });
    expect(r.code).toBe(1);
    expect(r.output).toMatch(/AUTH_SECRET: required in production/);
  });

  it('refuses a real Stripe key without STRIPE_WEBHOOK_SECRET', async () => {
    const r = await start({ AUTH_SECRET: SECRET, APP_URL: 'https://stochos.example', STRIPE_SECRET_KEY: 'sk_live_not_a_real_key_just_a_test' });
    expect(r.code).toBe(1);
    expect(r.output).toMatch(/STRIPE_WEBHOOK_SECRET: required with a real STRIPE_SECRET_KEY/);
  });

  it('refuses a plain-http APP_URL that is not the local demo', async () => {
    const r = await start({ AUTH_SECRET: SECRET, APP_URL: 'http://stochos.example' });
    expect(r.code).toBe(1);
    expect(r.output).toMatch(/APP_URL: must start with https:\/\//);
  });

  it('the test stack (like the demo) listens on loopback only', async () => {
    const appPort = new URL(inject('appUrl')).port;
    const outward = Object.values(os.networkInterfaces())
      .flat()
      .find((i) => i && i.family === 'IPv4' && !i.internal);
    expect((await fetch(`http://127.0.0.1:${appPort}/`, { redirect: 'manual' })).status).toBeLessThan(500);
    if (!outward) return; // a machine with no other interface has nothing to check
    await expect(fetch(`http://${outward.address}:${appPort}/`, { redirect: 'manual' })).rejects.toThrow();
  });
});
