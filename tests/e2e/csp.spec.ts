import { test, expect, type Page, type ConsoleMessage } from '@playwright/test';
import { E2E_APP, E2E_HOST } from './support/ports';
import { DEMO_PASSWORD, openQuayStudio } from './support/demo-sign-in';
import { Client } from '../support/http-client';
import { openTestDb, firmIdOf } from '../support/db-direct';
import { insertEmbedWidget } from '../integration/api/matrix/embed.rows';

// The Content-Security-Policy with per-request script nonces, in Chromium: the landing page, sign-in, the
// model docs, the studio and an embedded widget all hydrate and run their scripts (and the engine's web worker)
// with no violation reported, and each response carries its own nonce.


/** Collects CSP violations reported to the console or as securitypolicyviolation events, in every frame. */
function watchViolations(page: Page): string[] {
  const seen: string[] = [];
  page.on('console', (m: ConsoleMessage) => {
    if (/Content Security Policy|Refused to (load|execute|apply|connect|frame|create)/i.test(m.text())) seen.push(`console: ${m.text()}`);
  });
  page.on('pageerror', (e) => seen.push(`pageerror: ${e.message}`));
  return seen;
}

async function listenInPage(page: Page): Promise<void> {
  await page.addInitScript(() => {
    document.addEventListener('securitypolicyviolation', (e) => {
      console.error(`Content Security Policy violation: ${e.violatedDirective} blocked ${e.blockedURI}`);
    });
  });
}

function policyOf(headers: Record<string, string>): Record<string, string> {
  const out: Record<string, string> = {};
  for (const part of (headers['content-security-policy'] ?? '').split(';')) {
    const [name, ...rest] = part.trim().split(/\s+/);
    if (name) out[name] = rest.join(' ');
  }
  return out;
}

test('public pages carry a nonce policy, hydrate, and report no violation', async ({ page }) => {
  await listenInPage(page);
  const violations = watchViolations(page);
  const nonces = new Set<string>();
  for (const path of ['/', '/sign-in', '/docs/model-json', '/sign-up']) {
    const res = await page.goto(path);
    expect(res?.status(), path).toBe(200);
    const p = policyOf(res!.headers());
    expect(p['default-src'], path).toBe("'self'");
    const nonce = /'nonce-([^']+)'/.exec(p['script-src'] ?? '')?.[1];
    expect(nonce, path).toBeTruthy();
    nonces.add(nonce!);
    expect(p['frame-ancestors']).toBe("'none'");
    // Every script element Next wrote carries this response's nonce (the browser hides the attribute's value
    // from the DOM, but the property holds it).
    const scripts = await page.evaluate(() => Array.from(document.scripts).map((s) => ({ nonce: s.nonce, src: s.src })));
    expect(scripts.length, path).toBeGreaterThan(0);
    expect(scripts.filter((s) => s.nonce !== nonce), path).toEqual([]);
    // Hydrated: React attached its handlers (the root's container carries React's internal keys).
    await expect.poll(() => page.evaluate(() => Object.keys(document.body).some((k) => k.startsWith('__react')) || Object.keys(document.documentElement).some((k) => k.startsWith('__react'))), { message: path }).toBe(true);
  }
  expect(nonces.size).toBe(4);
  // A client-side check on the sign-in form works, so its script runs.
  await page.goto('/sign-in');
  await page.getByRole('button', { name: /^sign in$/i }).click();
  await expect(page.getByText(/e-mail/i).first()).toBeVisible();
  expect(violations).toEqual([]);
});

test('the studio runs its model in the web worker under the policy, with no violation', async ({ page }) => {
  await listenInPage(page);
  const violations = watchViolations(page);
  await openQuayStudio(page);
  expect(violations).toEqual([]);
});

test('an embedded widget on the host page gets its pass by postMessage and runs under its own policy', async ({ page }) => {
  await listenInPage(page);
  const violations = watchViolations(page);
  // A pass of its own for a client that allows the host page's origin.
  const db = openTestDb(process.env.E2E_DATA_DIR!);
  const author = new Client(E2E_APP);
  expect((await author.signIn('author@orrinvale.example', DEMO_PASSWORD)).ok).toBe(true);
  const c = await author.json<{ client: { id: string } }>('POST', '/api/clients', { name: `CSP client ${Date.now().toString(36)}`, allowedOrigins: [E2E_HOST], allowedEmailDomains: ['e2e-client.example'] });
  const g = await author.json<{ pass: { id: string } }>('POST', '/api/passes', { clientId: c.body.client.id, widgetId: insertEmbedWidget(db, firmIdOf(db, 'owner@orrinvale.example'), 'CSP widget') });
  db.close();
  expect(g.status).toBe(201);
  const embedRes = page.waitForResponse((r) => r.url().startsWith(`${E2E_APP}/embed/${g.body.pass.id}`));
  await page.goto(`${E2E_HOST}/?pass=${g.body.pass.id}`);
  const res = await embedRes;
  const p = policyOf(res.headers());
  expect(p['script-src']).toMatch(/^'self' 'nonce-[^']+'$/);
  expect(p['frame-ancestors']).toContain(E2E_HOST);
  const frame = page.frameLocator('iframe').first();
  await expect(frame.locator('[aria-live="polite"][aria-atomic="true"]').first()).not.toContainText('Computing', { timeout: 30_000 });
  expect(violations).toEqual([]);
});
