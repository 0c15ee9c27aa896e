// The fakes' test-only endpoints (fake Stripe's /_fake admin, the mailbox API) answer only this machine's
// scripts: a page on another origin, or a DNS-rebinding host name, is refused.
import fs from 'node:fs';
import http from 'node:http';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startFakeStripe, type FakeStripeHandle } from '@/lib/fakes/stripe/server';
import { startFakeSmtp, type FakeSmtpHandle } from '@/lib/fakes/smtp/server';

// fetch() will not set Host, so the probes use node:http.
function probe(url: string, method: string, headers: Record<string, string>): Promise<number> {
  return new Promise((resolve, reject) => {
    const req = http.request(url, { method, headers }, (res) => {
      res.resume();
      res.on('end', () => resolve(res.statusCode ?? 0));
    });
    req.on('error', reject);
    req.end();
  });
}

let stripe: FakeStripeHandle;
let smtp: FakeSmtpHandle;
let dir: string;

beforeAll(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'fake-local-'));
  stripe = await startFakeStripe({ port: 0, log: false });
  smtp = await startFakeSmtp({ smtpPort: 0, httpPort: 0, dir, log: false });
});
afterAll(async () => {
  await stripe?.close();
  await smtp?.close();
  fs.rmSync(dir, { recursive: true, force: true });
});

describe('fake Stripe admin endpoints', () => {
  it('answer a local script', async () => {
    expect(await probe(`${stripe.url}/_fake/health`, 'GET', {})).toBe(200);
    expect(await probe(`${stripe.url}/_fake/reset`, 'POST', { host: `localhost:${stripe.port}` })).toBe(200);
  });

  it('refuse another Host (DNS rebinding) and another Origin (a web page)', async () => {
    expect(await probe(`${stripe.url}/_fake/reset`, 'POST', { host: `evil.example:${stripe.port}` })).toBe(403);
    expect(await probe(`${stripe.url}/_fake/state`, 'GET', { origin: 'https://evil.example' })).toBe(403);
    expect(await probe(`${stripe.url}/_fake/reset`, 'POST', { origin: 'http://localhost:4100' })).toBe(403);
    expect(await probe(`${stripe.url}/_fake/reset`, 'POST', { origin: stripe.url })).toBe(200);
  });
});

describe('mailbox API of the fake SMTP server', () => {
  it('answers a local script and refuses a rebinding host name or a foreign page', async () => {
    expect(await probe(`${smtp.httpUrl}/messages`, 'GET', {})).toBe(200);
    expect(await probe(`${smtp.httpUrl}/messages`, 'GET', { host: 'evil.example' })).toBe(403);
    expect(await probe(`${smtp.httpUrl}/messages`, 'GET', { origin: 'https://evil.example' })).toBe(403);
  });
});
