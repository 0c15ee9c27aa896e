import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { listLivePassesForOrigin, type HostPass } from '@/db/passes';
import { mintPassToken } from '@/lib/server/embed/tokens';
import { embedSnippet } from '@/lib/server/embed/snippet';

/**
 * The demo host page: invented client portals on a second local origin, each embedding only the live widgets
 * granted to that client, through the same snippet an integrator pastes. With several clients, `/` lists their
 * portals and `?client=<id>` is one client's portal page; `?pass=<id>,<id>` narrows to some passes (one client's
 * portal when they all belong to one client).
 */
export interface HostPage {
  url: string;
  close(): Promise<void>;
}

const esc = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');

async function snippetFor(p: HostPass, appUrl: string): Promise<string> {
  const token = await mintPassToken({ passId: p.passId, clientId: p.clientId, keyVersion: p.token.keyVersion, jti: p.token.jti, issuedAt: p.token.issuedAt, expiresAt: p.token.expiresAt });
  // Only the placeholder: the loader script is included once at the end of the page.
  return embedSnippet({ appUrl, passId: p.passId, token, title: p.widgetTitle }).split('\n')[0]!;
}

export function renderHostPage(o: { passes: HostPass[]; snippets: string[]; appUrl: string; origin: string }): string {
  const clientName = o.passes[0]?.clientName ?? 'Client portal';
  const firmName = o.passes[0]?.firmName ?? 'your consultants';
  const sections = o.passes
    .map(
      (p, i) => `
      <section class="card" aria-labelledby="w${i}">
        <h2 id="w${i}">${esc(p.widgetTitle)}</h2>
        <p class="lead">Interactive model supplied by ${esc(p.firmName)}. Move the dials to explore the figures for your own assumptions.</p>
        ${o.snippets[i]}
      </section>`,
    )
    .join('\n');
  const empty = `<section class="card"><h2>No models shared yet</h2><p class="lead">When your consultants grant a model to ${esc(clientName)} for ${esc(o.origin)}, it appears here.</p></section>`;
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${esc(clientName)} · Project portal</title>
<style>
  :root { --navy: #1d2a4d; --sand: #f4efe6; --line: #d9d2c3; --text: #1f2430; }
  * { box-sizing: border-box; }
  body { margin: 0; font: 16px/1.5 Georgia, 'Times New Roman', serif; color: var(--text); background: var(--sand); }
  header { background: var(--navy); color: #fff; padding: 14px 24px; display: flex; align-items: center; gap: 16px; flex-wrap: wrap; }
  header .brand { font: 700 18px/1.2 Verdana, sans-serif; letter-spacing: .02em; }
  header nav a { color: #dfe6ff; margin-right: 14px; font: 14px Verdana, sans-serif; text-decoration: none; }
  header nav a[aria-current] { text-decoration: underline; }
  main { max-width: 980px; margin: 0 auto; padding: 24px 16px 48px; }
  h1 { font-size: 28px; margin: 4px 0 4px; }
  .meta { font: 13px Verdana, sans-serif; color: #555; margin: 0 0 20px; }
  .card { background: #fff; border: 1px solid var(--line); border-radius: 4px; padding: 16px; margin: 0 0 20px; }
  .card h2 { font-size: 20px; margin: 0 0 4px; }
  .lead { margin: 0 0 12px; color: #444; font-size: 15px; }
  .columns { display: grid; grid-template-columns: minmax(0, 1fr); gap: 0 20px; }
  footer { text-align: center; font: 12px Verdana, sans-serif; color: #666; padding: 16px; }
</style>
</head>
<body>
<header>
  <span class="brand">${esc(clientName)}</span>
  <nav aria-label="Portal"><a href="#">Projects</a><a href="#" aria-current="page">Engineering reviews</a><a href="#">Documents</a></nav>
</header>
<main>
  <p class="meta">Project portal · Engineering reviews</p>
  <h1>Design review: shared models</h1>
  <p class="lead">These models were prepared for us by ${esc(firmName)}. Move a dial and the figures are recomputed in your browser; nothing you try here changes the consultants’ signed-off version.</p>
  <div class="columns">${o.passes.length ? sections : empty}</div>
</main>
<footer>${esc(clientName)} · internal portal (an invented organisation for the Stochos demo)</footer>
<script async src="${esc(o.appUrl.replace(/\/+$/, ''))}/embed/stochos-embed.js"></script>
</body>
</html>`;
}

/** Groups passes by client, in the order they came (the query sorts by client name). */
export function groupByClient(passes: HostPass[]): HostPass[][] {
  const groups = new Map<string, HostPass[]>();
  for (const p of passes) groups.set(p.clientId, [...(groups.get(p.clientId) ?? []), p]);
  return [...groups.values()];
}

/** The list of client portals served on this origin: each client's own page, never one page mixing them. */
export function renderPortalIndex(o: { groups: HostPass[][]; origin: string; query?: string }): string {
  const items = o.groups
    .map((g) => {
      const c = g[0]!;
      const href = `/?client=${encodeURIComponent(c.clientId)}${o.query ? `&${o.query}` : ''}`;
      return `<li><a href="${esc(href)}">${esc(c.clientName)}</a> <span class="meta">${g.length} shared ${g.length === 1 ? 'model' : 'models'} from ${esc(c.firmName)}</span></li>`;
    })
    .join('\n');
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>Demo client portals</title>
<style>
  body { margin: 0; font: 16px/1.5 Verdana, sans-serif; color: #1f2430; background: #f4efe6; }
  main { max-width: 720px; margin: 0 auto; padding: 32px 16px; }
  h1 { font-size: 24px; margin: 0 0 8px; }
  ul { padding: 0; list-style: none; }
  li { background: #fff; border: 1px solid #d9d2c3; border-radius: 4px; padding: 12px 16px; margin: 0 0 12px; }
  a { color: #1d2a4d; font-weight: 700; }
  .meta { display: block; font-size: 14px; color: #555; }
</style>
</head>
<body>
<main>
  <h1>Demo client portals</h1>
  <p>Each invented client organisation has its own portal page on ${esc(o.origin)}, showing only the models granted to it.</p>
  <ul>${items}</ul>
</main>
</body>
</html>`;
}

export async function startHostPage(o: { port: number; appUrl: string; host?: string }): Promise<HostPage> {
  const host = o.host ?? 'localhost';
  const origin = `http://${host}:${o.port}`;
  const server = http.createServer(async (req, res) => {
    try {
      const url = new URL(req.url ?? '/', origin);
      if (url.pathname === '/healthz') {
        res.writeHead(200, { 'content-type': 'text/plain' }).end('ok');
        return;
      }
      if (url.pathname !== '/') {
        res.writeHead(404, { 'content-type': 'text/plain' }).end('Not found');
        return;
      }
      const only = url.searchParams.get('pass')?.split(',').filter(Boolean);
      const client = url.searchParams.get('client');
      const passes = (await listLivePassesForOrigin(origin)).filter((p) => (!only || only.includes(p.passId)) && (!client || p.clientId === client));
      const groups = groupByClient(passes);
      const head = { 'content-type': 'text/html; charset=utf-8', 'cache-control': 'no-store' };
      if (groups.length > 1) {
        const query = only ? `pass=${encodeURIComponent(only.join(','))}` : undefined;
        res.writeHead(200, head).end(renderPortalIndex({ groups, origin, query }));
        return;
      }
      const snippets = await Promise.all(passes.map((p) => snippetFor(p, o.appUrl)));
      res.writeHead(200, head).end(renderHostPage({ passes, snippets, appUrl: o.appUrl, origin }));
    } catch (err) {
      console.error('[host page]', err);
      res.writeHead(500, { 'content-type': 'text/plain' }).end('The demo host page failed; see the demo console.');
    }
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(o.port, '127.0.0.1', () => resolve());
  });
  const port = (server.address() as AddressInfo).port;
  return {
    url: `http://${host}:${port}`,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
