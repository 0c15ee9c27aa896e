import { describe, it, expect, beforeAll } from 'vitest';
import { randomUUID } from 'node:crypto';
import { useFreshDb } from '../../support/test-db';
import { seedFirmWithWidget, memberOf } from './fixtures';
import { createClient, createPass, passView, revokePass } from '@/lib/server/embed/service';
import { embedCsp, embedFrame } from '@/lib/server/embed/headers';

const embedResponseHeaders = async (pathname: string) => (await embedFrame(pathname)).headers;
import { embedSnippet, embedPageUrl } from '@/lib/server/embed/snippet';
import { passStatus, passWorks, passRenewable } from '@/lib/core/embed/status';
import { viewerDials } from '@/lib/core/embed/payload';
import { DIALED_MODEL } from './fixtures';
import { checked } from '../../support/checked';

let firm: Awaited<ReturnType<typeof seedFirmWithWidget>>;
beforeAll(async () => {
  await useFreshDb();
  firm = await seedFirmWithWidget();
});

const ancestors = (h: Record<string, string>) => /frame-ancestors ([^;]*)/.exec(h['Content-Security-Policy'] ?? '')?.[1]?.trim();

// CSP Level 3 §6.4.2 frame-ancestors: a source list, or 'none' (W3C Content Security Policy Level 3).
describe('embed response headers', () => {
  it('name exactly the client’s allowed origins for a live pass, with no-referrer', async () => {
    const m = memberOf(firm.firmId, firm.userId);
    const c = await createClient(m, { name: 'Headers Ltd', allowedOrigins: ['https://portal.headers.example', 'http://localhost:4100'], allowedEmailDomains: [] });
    const p = await passView(await createPass(m, { clientId: c.id, widgetId: firm.widgetId, days: 90 }));
    const h = await embedResponseHeaders(`/embed/${p.id}`);
    expect(ancestors(h)).toBe('https://portal.headers.example http://localhost:4100');
    expect(h['Referrer-Policy']).toBe('no-referrer');
    expect(h['X-Content-Type-Options']).toBe('nosniff');
    expect(h['X-Frame-Options']).toBeUndefined();

    // Revoked: the refusal message stays framable by the same origins; nothing else is on that page.
    await revokePass(m, p.id);
    expect(ancestors(await embedResponseHeaders(`/embed/${p.id}`))).toBe('https://portal.headers.example http://localhost:4100');
  });

  it("say 'none' when no client can be named", async () => {
    expect(ancestors(await embedResponseHeaders(`/embed/${randomUUID()}`))).toBe("'none'");
    expect(ancestors(await embedResponseHeaders('/embed/not-an-id'))).toBe("'none'");
    expect(embedCsp([])).toMatch(/; frame-ancestors 'none'$/);
    expect(embedCsp(['https://a.example'], 'n0nce')).toMatch(/script-src 'self' 'nonce-n0nce'.*base-uri 'none'.*frame-ancestors https:\/\/a\.example$/);
  });

  it('let any site load the loader script but frame nothing', async () => {
    const h = await embedResponseHeaders('/embed/stochos-embed.js');
    expect(h['Cross-Origin-Resource-Policy']).toBe('cross-origin');
    expect(ancestors(h)).toBe("'none'");
  });
});

describe('snippet', () => {
  it('escapes attribute values and builds the loader URL from the app URL', () => {
    const s = embedSnippet({ appUrl: 'https://stochos.example/', passId: 'p1', token: 'a.b.c', title: 'Shaft "A" <float> & gap' });
    expect(s).toBe(
      '<div data-stochos-pass="p1" data-stochos-token="a.b.c" data-stochos-title="Shaft &quot;A&quot; &lt;float&gt; &amp; gap"></div>\n<script async src="https://stochos.example/embed/stochos-embed.js"></script>',
    );
    expect(embedPageUrl({ appUrl: 'https://stochos.example', passId: 'p1', token: 'a.b.c', origin: 'https://portal.example' })).toBe(
      'https://stochos.example/embed/p1?origin=https%3A%2F%2Fportal.example#pass=a.b.c',
    );
  });
});

describe('pass status', () => {
  const base = { expiresAt: new Date(Date.now() + 60 * 86_400_000).toISOString(), revokedAt: null, revokeReason: null, clientArchivedAt: null, widgetUnpublishedAt: null } as const;
  it('orders revoked, expired, suspended, unpublished, expiring, active', () => {
    const now = Date.now();
    expect(passStatus(base, now)).toBe('active');
    expect(passStatus({ ...base, expiresAt: new Date(now + 13 * 86_400_000).toISOString() }, now)).toBe('expiring');
    expect(passStatus({ ...base, widgetUnpublishedAt: 'x' }, now)).toBe('unpublished');
    expect(passStatus({ ...base, clientArchivedAt: 'x', widgetUnpublishedAt: 'x' }, now)).toBe('suspended');
    expect(passStatus({ ...base, clientArchivedAt: 'x', expiresAt: new Date(now - 1).toISOString() }, now)).toBe('expired');
    expect(passStatus({ ...base, revokedAt: 'x', revokeReason: 'revoked', expiresAt: new Date(now - 1).toISOString() }, now)).toBe('revoked');
    expect(passStatus({ ...base, revokedAt: 'x', revokeReason: 'key_rotated' }, now)).toBe('key_rotated');
    expect([passWorks('expiring'), passWorks('suspended'), passRenewable('expired'), passRenewable('key_rotated')]).toEqual([true, false, true, false]);
  });
});

describe('viewer dials', () => {
  it('keeps only the dials the widget exposes, with their ranges', () => {
    expect(viewerDials(checked(DIALED_MODEL), ['bore'])).toEqual([{ id: 'bore', min: 24.9, max: 25.1 }]);
    expect(viewerDials(checked(DIALED_MODEL), [])).toEqual([]);
  });
});
