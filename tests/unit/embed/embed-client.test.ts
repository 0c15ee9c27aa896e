import { afterEach, describe, expect, it, vi } from 'vitest';
import { createEmbedClient, refusalOf } from '@/components/embed/embed-client';
import { toErrorResponse } from '@/lib/server/http/handler';
import { AppError, titled } from '@/lib/server/http/errors';
import { answer, calls } from '../../support/fetch-answers';

// The embed page's client over the shared request helper. fetch is replaced at this test's edge: each call gets
// the next prepared Response (error bodies written by the server's own mapper).

const ok = (body: unknown, status = 200) => new Response(JSON.stringify(body), { status, headers: { 'content-type': 'application/json' } });
const session = (token: string) => ok({ token, expiresAt: Math.floor(Date.now() / 1000) + 600, passId: 'p1' });
const auth = (i: number) => (calls[i]!.init.headers as Record<string, string>).authorization;
const client = () => createEmbedClient({ passId: 'p1', pass: 'secret-pass', origin: 'https://portal.example' });

afterEach(() => vi.unstubAllGlobals());

describe('embed client', () => {
  it('exchanges the pass once, then calls with the bearer and no cookies', async () => {
    answer(session('t1'), ok({ widget: 'payload' }), new Response(null, { status: 204 }));
    const c = client();
    expect(await c.loadWidget()).toEqual({ widget: 'payload' });
    await c.reportDial('d1', 3);
    expect(calls.map((x) => x.url)).toEqual(['/api/embed/session', '/api/embed/passes/p1/widget', '/api/embed/passes/p1/events']);
    expect(JSON.parse(calls[0]!.init.body as string)).toEqual({ passId: 'p1', pass: 'secret-pass', origin: 'https://portal.example' });
    expect([auth(1), auth(2)]).toEqual(['Bearer t1', 'Bearer t1']);
    expect(calls.every((x) => x.init.credentials === 'omit' && x.init.cache === 'no-store')).toBe(true);
  });

  it('a refused token is exchanged again once; a second refusal is thrown', async () => {
    const expired = () => toErrorResponse(titled('unauthorized', 'The viewing session has ended', 'Reload the page to continue.'));
    answer(session('t1'), expired(), session('t2'), ok({ widget: 'again' }));
    expect(await client().loadWidget()).toEqual({ widget: 'again' });
    expect(auth(3)).toBe('Bearer t2');

    answer(session('t1'), expired(), session('t2'), expired());
    const err = await client().loadWidget().catch((e: unknown) => e);
    expect(calls).toHaveLength(4);
    expect(refusalOf(err)).toEqual({ status: 401, title: 'The viewing session has ended', body: 'Reload the page to continue.' });
  });

  it('shows the server’s heading and text apart, a plain refusal under a general heading, a lost connection as such', async () => {
    answer(toErrorResponse(titled('unauthorized', 'Access to this widget was withdrawn', 'Orrinvale Ltd. has revoked this pass. Contact them if you still need the widget.')));
    const revoked = await client().loadWidget().catch((e: unknown) => e);
    expect(refusalOf(revoked)).toEqual({ status: 401, title: 'Access to this widget was withdrawn', body: 'Orrinvale Ltd. has revoked this pass. Contact them if you still need the widget.' });

    answer(session('t1'), toErrorResponse(new AppError('forbidden', 'This access token was issued for another widget.')));
    expect(refusalOf(await client().loadWidget().catch((e: unknown) => e))).toEqual({ status: 403, title: 'This widget cannot be shown', body: 'This access token was issued for another widget.' });

    answer(new Response('busy', { status: 429 }));
    expect(refusalOf(await client().loadWidget().catch((e: unknown) => e))).toEqual({ status: 429, title: 'Too many requests', body: 'Wait a moment and try again.' });

    answer(new TypeError('Failed to fetch'));
    expect(refusalOf(await client().loadWidget().catch((e: unknown) => e))).toEqual({ status: 0, title: 'This widget cannot be shown', body: 'Check the connection and reload the page.' });
  });

  it('"E-mail this view": 202 gives the sentence; a refused address its field message; a limit its message; a fault nothing', async () => {
    answer(
      session('t1'),
      ok({ message: 'On its way to a@portal.example.' }, 202),
      toErrorResponse(new AppError('validation_failed', 'Some fields need attention.', { fields: { email: ['Snapshots go only to addresses at portal.example.'] } })),
      toErrorResponse(new AppError('rate_limited', 'Three snapshots an hour from one viewer; try again in 20 minutes.', { retryAfter: 1200 })),
      new Response('<html>Bad gateway</html>', { status: 502 }),
      new TypeError('Failed to fetch'),
    );
    const c = client();
    const body = { email: 'a@portal.example', dialValues: {} };
    expect(await c.sendSnapshot(body)).toEqual({ ok: true, message: 'On its way to a@portal.example.' });
    expect(await c.sendSnapshot(body)).toEqual({ ok: false, message: 'Snapshots go only to addresses at portal.example.' });
    expect(await c.sendSnapshot(body)).toEqual({ ok: false, message: 'Three snapshots an hour from one viewer; try again in 20 minutes.' });
    expect(await c.sendSnapshot(body)).toEqual({ ok: false, message: null });
    expect(await c.sendSnapshot(body)).toEqual({ ok: false, message: null });
  });
});
