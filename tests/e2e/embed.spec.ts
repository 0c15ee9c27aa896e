import http from 'node:http';
import { randomUUID } from 'node:crypto';
import type { AddressInfo } from 'node:net';
import { test, expect, type Page, type FrameLocator, type Frame } from '@playwright/test';
import AxeBuilder from '@axe-core/playwright';
import type Database from 'better-sqlite3';
import { Client } from '../support/http-client';
import { openTestDb, firmIdOf } from '../support/db-direct';
import { insertEmbedWidget } from '../integration/api/matrix/embed.rows';
import { mintPassToken } from '@/lib/server/embed/tokens';
import { E2E, E2E_APP, E2E_HOST } from './support/ports';

// Embeds in Chromium: the demo host page on a second origin (http://localhost:4300) frames widgets through the
// integrator's snippet; other origins get a blank frame; bad passes get a friendly message in the frame.

const APP = E2E_APP;
const HOST = E2E_HOST;
const OTHER_HOST = `http://127.0.0.1:${E2E.hostPagePort}`; // same server, another origin: not allowed

let db: Database.Database;
let firmId: string;
let author: Client;

test.beforeAll(async () => {
  db = openTestDb(process.env.E2E_DATA_DIR!);
  firmId = firmIdOf(db, 'owner@orrinvale.example');
  author = new Client(APP);
  const s = await author.signIn('author@orrinvale.example', 'stochos-demo-2026');
  expect(s.ok).toBe(true);
});
test.afterAll(() => db?.close());

interface Pass {
  id: string;
  snippet: string;
  clientId: string;
  token: string;
}

async function newClient(origins = [HOST]): Promise<string> {
  const r = await author.json<{ client: { id: string } }>('POST', '/api/clients', { name: `E2E client ${Date.now().toString(36)}${Math.floor(performance.now())}`, allowedOrigins: origins, allowedEmailDomains: ['e2e-client.example'] });
  expect(r.status).toBe(201);
  return r.body.client.id;
}

async function grant(clientId: string, title = 'Gearbox shaft float'): Promise<Pass> {
  const widgetId = insertEmbedWidget(db, firmId, title);
  const r = await author.json<{ pass: { id: string; snippet: string } }>('POST', '/api/passes', { clientId, widgetId });
  expect(r.status).toBe(201);
  return { id: r.body.pass.id, snippet: r.body.pass.snippet, clientId, token: /data-stochos-token="([^"]+)"/.exec(r.body.pass.snippet)![1]! };
}

/**
 * A portal page with hand-written snippets, served from loopback on a port the system picks (a routed page
 * would count as a public address, and Chromium keeps public pages from loading loopback resources).
 */
async function customHost(): Promise<{ origin: string; show: (page: Page, body: string) => Promise<void>; close: () => Promise<void> }> {
  let html = '';
  const server = http.createServer((_req, res) => res.writeHead(200, { 'content-type': 'text/html' }).end(html));
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const origin = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  return {
    origin,
    show: async (page, body) => {
      html = `<!doctype html><html lang="en"><head><title>Portal</title></head><body><h1>Portal</h1>${body}</body></html>`;
      await page.goto(`${origin}/`);
    },
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

const placeholder = (passId: string, token: string, title = 'Widget') => `<div data-stochos-pass="${passId}" data-stochos-token="${token}" data-stochos-title="${title}"></div>`;
const LOADER = `<script async src="${APP}/embed/stochos-embed.js"></script>`;

function embedFrame(page: Page, passId: string): Frame {
  const f = page.frames().find((x) => x.url().includes(`/embed/${passId}`));
  if (!f) throw new Error(`no frame for ${passId}`);
  return f;
}

// The headline figure's live region in the widget.
const HEADLINE = '[aria-live="polite"][aria-atomic="true"]';
const headline = (f: FrameLocator) => f.locator(HEADLINE).first();

test('the demo host page on the second origin shows the widget, sized to its content; a dial move updates the headline', async ({ page }) => {
  const clientId = await newClient();
  const pass = await grant(clientId, 'Gearbox shaft float');
  await page.goto(`${HOST}/?pass=${pass.id}`);
  const frameEl = page.locator(`iframe[title="Gearbox shaft float"]`);
  await expect(frameEl).toBeVisible();
  const f = page.frameLocator(`iframe[title="Gearbox shaft float"]`);
  await expect(f.getByRole('heading', { name: 'Gearbox shaft float' }).first()).toBeVisible();
  await expect(headline(f)).toBeVisible();
  await expect(headline(f)).not.toContainText('Computing');

  // Sized to its content: the frame's height follows the document inside it (iframe-resizer), not the loader's 360 px start.
  await expect
    .poll(async () => {
      const inner = await embedFrame(page, pass.id).evaluate(() => document.documentElement.offsetHeight);
      const outer = await frameEl.evaluate((el) => (el as HTMLIFrameElement).getBoundingClientRect().height);
      return Math.abs(inner - outer);
    })
    .toBeLessThanOrEqual(2);
  const height = await frameEl.evaluate((el) => (el as HTMLIFrameElement).getBoundingClientRect().height);
  expect(height).not.toBe(360);

  const before = await headline(f).textContent();
  const slider = f.getByRole('slider').first();
  await slider.focus();
  await slider.press('End');
  await expect(headline(f)).not.toHaveText(before ?? '');

  // The move is counted for the pass's analytics once it settles.
  await expect.poll(async () => (await author.json<{ pass: { counts: { load: number; dial: number } } }>('GET', `/api/passes/${pass.id}`)).body.pass.counts).toMatchObject({ load: 1, dial: 1 });
});

test('the pass reaches the frame by postMessage: no request URL, frame address or history entry carries it', async ({ page }) => {
  const clientId = await newClient();
  const pass = await grant(clientId, 'Token stays out of URLs');
  const urls: string[] = [];
  page.on('request', (r) => urls.push(r.url()));
  await page.goto(`${HOST}/?pass=${pass.id}`);
  const f = page.frameLocator('iframe[title="Token stays out of URLs"]');
  await expect(headline(f)).toBeVisible();
  await expect(headline(f)).not.toContainText('Computing');
  const frame = embedFrame(page, pass.id);
  expect(frame.url()).not.toContain('pass=');
  expect(frame.url()).not.toContain(pass.token);
  expect(urls.some((u) => u.includes(`/embed/${pass.id}`))).toBe(true);
  expect(urls.filter((u) => u.includes(pass.token))).toEqual([]);
  // The exchange took the token in its body.
  expect(await frame.evaluate(() => location.href)).not.toContain('#');
});

test('a direct link with the pass in the fragment works, and the page drops the fragment from its address', async ({ page }) => {
  const clientId = await newClient();
  const pass = await grant(clientId, 'Direct link');
  const urls: string[] = [];
  page.on('request', (r) => urls.push(r.url()));
  await page.goto(`${APP}/embed/${pass.id}#pass=${encodeURIComponent(pass.token)}`);
  await expect(page.locator(HEADLINE).first()).not.toContainText('Computing');
  expect(page.url()).toBe(`${APP}/embed/${pass.id}`);
  expect(urls.filter((u) => u.includes(pass.token))).toEqual([]);
});

test('a frame that a page at another allowed origin opens without the loader gets no pass from anyone else', async ({ page }) => {
  // A hand-made frame with no loader on the parent: nobody answers the frame's request, so it explains itself.
  const host = await customHost();
  const clientId = await newClient([host.origin]);
  const pass = await grant(clientId, 'No loader');
  await host.show(page, `<iframe title="No loader" src="${APP}/embed/${pass.id}?origin=${encodeURIComponent(host.origin)}"></iframe>`);
  await expect(page.frameLocator('iframe[title="No loader"]').getByRole('alert', { name: /This widget link is not valid/ })).toBeVisible({ timeout: 20_000 });
  await host.close();
});

test('several widgets on one host page each load in their own frame', async ({ page }) => {
  const clientId = await newClient();
  const a = await grant(clientId, 'Spacer study A');
  const b = await grant(clientId, 'Spacer study B');
  await page.goto(`${HOST}/?pass=${a.id},${b.id}`);
  for (const t of ['Spacer study A', 'Spacer study B']) {
    await expect(page.frameLocator(`iframe[title="${t}"]`).getByRole('heading', { name: t }).first()).toBeVisible();
  }
  await expect(page.locator('iframe')).toHaveCount(2);
});

test('the same embed framed by a page on an origin the client did not allow is refused by the browser', async ({ page }) => {
  const clientId = await newClient();
  const pass = await grant(clientId, 'Refused elsewhere');
  const embedResponse = page.waitForResponse((r) => r.url().startsWith(`${APP}/embed/${pass.id}`));
  await page.goto(`${OTHER_HOST}/?pass=${pass.id}`);
  const res = await embedResponse;
  expect(/frame-ancestors ([^;]*)/.exec(res.headers()['content-security-policy'] ?? '')?.[1]?.trim()).toBe(HOST);
  // Chromium replaces a frame refused by frame-ancestors with an empty error document.
  await expect.poll(() => page.frames().find((fr) => fr !== page.mainFrame())?.url()).toMatch(/^chrome-error:|^about:blank/);
  const frame = page.frames().find((fr) => fr !== page.mainFrame())!;
  expect(await frame.locator('body').innerText().catch(() => '')).not.toContain('Refused elsewhere');
});

test('a tampered, expired, revoked or other-client pass shows a friendly message in the frame and gets 401/403 from the API', async ({ page }) => {
  const host = await customHost();
  const clientA = await newClient([host.origin]);
  const clientB = await newClient([host.origin]);
  const good = await grant(clientA, 'Tamper target');
  const other = await grant(clientB, 'Other client widget');
  const revoked = await grant(clientA, 'Soon revoked');
  expect((await author.json('POST', `/api/passes/${revoked.id}/revoke`)).status).toBe(200);

  const [h, p, s] = good.token.split('.');
  const claims = JSON.parse(Buffer.from(p!, 'base64url').toString());
  claims.exp += 365 * 86_400;
  const tampered = `${h}.${Buffer.from(JSON.stringify(claims)).toString('base64url')}.${s}`;
  const row = db.prepare('select jti, issued_at from pass_tokens where pass_id = ?').get(good.id) as { jti: string; issued_at: string };
  const expired = await mintPassToken({ passId: good.id, clientId: clientA, keyVersion: 1, jti: row.jti, issuedAt: row.issued_at, expiresAt: new Date(Date.now() - 60_000).toISOString() });

  const cases = [
    { name: 'tampered', passId: good.id, token: tampered, message: /This widget link is not valid/, status: 401 },
    { name: 'expired', passId: good.id, token: expired, message: /Access to this widget has expired/, status: 401 },
    { name: 'revoked', passId: revoked.id, token: revoked.token, message: /Access to this widget was withdrawn/, status: 401 },
    { name: 'other client', passId: good.id, token: other.token, message: /This snippet does not match its pass/, status: 403 },
  ];
  await host.show(page, cases.map((c) => placeholder(c.passId, c.token, c.name)).join('\n') + LOADER);
  for (const c of cases) {
    await expect(page.frameLocator(`iframe[title="${c.name}"]`).getByRole('alert', { name: c.message }), c.name).toBeVisible();
    const api = await new Client(APP).json('POST', '/api/embed/session', { passId: c.passId, pass: c.token });
    expect(api.status, c.name).toBe(c.status);
  }
  // A bearer token of one client's pass opens nothing of another client's.
  const bearer = (await new Client(APP).json<{ token: string }>('POST', '/api/embed/session', { passId: other.id, pass: other.token })).body.token;
  const cross = await new Client(APP).request('GET', `/api/embed/passes/${good.id}/widget`, undefined, { authorization: `Bearer ${bearer}` });
  expect(cross.status).toBe(403);
  await host.close();
});

test('a pass revoked while the widget is open stops on the next call', async ({ page }) => {
  const clientId = await newClient();
  const pass = await grant(clientId, 'Revoked while open');
  await page.goto(`${HOST}/?pass=${pass.id}`);
  const f = page.frameLocator('iframe[title="Revoked while open"]');
  await expect(headline(f)).toBeVisible();
  expect((await author.json('POST', `/api/passes/${pass.id}/revoke`)).status).toBe(200);
  const refused = page.waitForResponse((r) => r.url().includes(`/api/embed/passes/${pass.id}/events`) && r.status() === 401);
  const slider = f.getByRole('slider').first();
  await slider.focus();
  await slider.press('End');
  await refused;
  await expect(f.getByRole('alert', { name: /Access to this widget was withdrawn/ })).toBeVisible();
});

test('the embed page and its refusal message have no serious or critical accessibility violations', async ({ page }) => {
  const clientId = await newClient();
  const pass = await grant(clientId, 'Accessible widget');
  // A direct link carries the pass in the fragment, which the browser never sends to the server.
  await page.goto(`${APP}/embed/${pass.id}#pass=${encodeURIComponent(pass.token)}`);
  await expect(page.locator(HEADLINE).first()).not.toContainText('Computing');
  const results = await new AxeBuilder({ page }).analyze();
  const bad = results.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
  expect(bad.map((v) => `${v.id}: ${v.help} (${v.nodes.length})`)).toEqual([]);

  // A fresh load (a new fragment alone would not reload the page).
  await page.goto('about:blank');
  await page.goto(`${APP}/embed/${pass.id}#pass=not.a.token`);
  await expect(page.getByRole('alert', { name: /This widget link is not valid/ })).toBeVisible();
  const notice = await new AxeBuilder({ page }).analyze();
  expect(notice.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical').map((v) => v.id)).toEqual([]);
});

// The pass check fails (here: its table is briefly renamed, as a broken database would fail it): the frame shows its
// own error screen with the reference of the logged failure, framable by nobody, and Try again loads it afresh.
test('a pass check that fails shows the embed error screen with a reference, and Try again reloads the frame', async ({ page }) => {
  const clientId = await newClient();
  const pass = await grant(clientId, 'Failing check');
  db.exec('ALTER TABLE passes RENAME TO passes_unavailable');
  try {
    const res = await page.goto(`${APP}/embed/${pass.id}`);
    expect(res?.status()).toBe(500);
    expect(res?.headers()['content-security-policy']).toMatch(/frame-ancestors 'none'/);
    expect(res?.headers()['referrer-policy']).toBe('no-referrer');
    await expect(page.getByRole('heading', { level: 1, name: 'This widget could not be shown' })).toBeVisible();
    await expect(page.getByTestId('error-reference')).toHaveText(/^[0-9a-f]{10}$/);
    const axe = await new AxeBuilder({ page }).analyze();
    expect(axe.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical').map((v) => v.id)).toEqual([]);
  } finally {
    db.exec('ALTER TABLE passes_unavailable RENAME TO passes');
  }
  // Reloaded without a pass (no loader, no fragment), the frame now gets past the check and explains what it lacks.
  await page.getByRole('button', { name: 'Try again' }).click();
  await expect(page.getByRole('alert', { name: /This widget link is not valid/ })).toBeVisible();
});

// The embed fetches the formula parser and the correlation code only for models that use them (optional-parts.ts):
// a published formula model and a cost model with correlated items must still show their figures in the frame.
test('a formula model and a correlated cost model load their engine parts on demand and show figures', async ({ page }) => {
  const { validateModel } = await import('@/lib/core/engine/schema');
  const { EXAMPLE_MODELS } = await import('@/lib/core/engine/examples');
  const cost = EXAMPLE_MODELS['cost-range'] as { correlationGroups?: unknown[] };
  expect(cost.correlationGroups?.length ?? 0).toBeGreaterThan(0);
  const clientId = await newClient();
  const passes: Pass[] = [];
  const titles = { formula: 'Formula model on demand', 'cost-range': 'Correlated cost model on demand' } as const;
  for (const template of ['formula', 'cost-range'] as const) {
    const checked = validateModel(EXAMPLE_MODELS[template]);
    if (!checked.ok) throw new Error(`${template} example does not validate`);
    const widgetId = insertEmbedWidget(db, firmId, titles[template]);
    const w = db.prepare('select version_id, model_id from widgets where id = ?').get(widgetId) as { version_id: string; model_id: string };
    // Publish the example (versions are immutable: a second one) instead of the stack the helper stores.
    const versionId = randomUUID();
    const at = new Date().toISOString();
    db.prepare("insert into model_versions (id, model_id, firm_id, number, model_json, created_at, check_state, checked_at) values (?,?,?,2,?,?,'signed_off',?)").run(versionId, w.model_id, firmId, JSON.stringify(checked.model), at, at);
    db.prepare('update models set template = ?, draft_json = ? where id = ?').run(template, JSON.stringify(checked.model), w.model_id);
    db.prepare("update widgets set version_id = ?, dial_ids = '[]' where id = ?").run(versionId, widgetId);
    const r = await author.json<{ pass: { id: string; snippet: string } }>('POST', '/api/passes', { clientId, widgetId });
    expect(r.status).toBe(201);
    passes.push({ id: r.body.pass.id, snippet: r.body.pass.snippet, clientId, token: /data-stochos-token="([^"]+)"/.exec(r.body.pass.snippet)![1]! });
  }
  await page.goto(`${HOST}/?pass=${passes.map((p) => p.id).join(',')}`);
  for (const t of Object.values(titles)) {
    const f = page.frameLocator(`iframe[title="${t}"]`);
    await expect(headline(f).locator('.num')).toBeVisible({ timeout: 30_000 });
    await expect(f.getByText('These settings cannot be computed')).toHaveCount(0);
    await expect(f.getByText('This model cannot be shown')).toHaveCount(0);
  }
});
