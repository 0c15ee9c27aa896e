import { afterEach, describe, expect, it, vi } from 'vitest';
import { z } from 'zod';
import { ApiError, api, applyServerErrors, errorFrom, errorMessage, parseRetryAfter, requestJson } from '@/lib/client/api';
import { toErrorResponse } from '@/lib/server/http/handler';
import { AppError, titled, validationError } from '@/lib/server/http/errors';
import { answer, calls } from '../../support/fetch-answers';

// The browser's one API client. fetch is replaced at this test's edge only: each case hands back a real Response.

const jsonResponse = (status: number, body: unknown, headers: Record<string, string> = {}) =>
  new Response(JSON.stringify(body), { status, headers: { 'content-type': 'application/json', ...headers } });

async function failure(p: Promise<unknown>): Promise<ApiError> {
  const err = await p.then(
    () => null,
    (e: unknown) => e,
  );
  expect(err).toBeInstanceOf(ApiError);
  return err as ApiError;
}

afterEach(() => vi.unstubAllGlobals());

describe('error shape', () => {
  it('reads a 422 with its field messages, code and message', async () => {
    answer(jsonResponse(422, { error: { code: 'validation_failed', message: 'Some fields need attention.', fields: { name: ['Give the dataset a name.'], 'contributors.0.nominal': ['Must be a number.', 'Must be finite.'] } } }));
    const err = await failure(api.post('/api/datasets', { name: '' }));
    expect(err.status).toBe(422);
    expect(err.code).toBe('validation_failed');
    expect(err.message).toBe('Some fields need attention.');
    expect(err.fields).toEqual({ name: ['Give the dataset a name.'], 'contributors.0.nominal': ['Must be a number.', 'Must be finite.'] });
  });

  it('drops a fields value that is not messages per path', () => {
    const err = errorFrom(new Response(null, { status: 422 }), { error: { code: 'validation_failed', message: 'Bad.', fields: { name: 'not an array' } } });
    expect(err.fields).toBeUndefined();
    expect(err.message).toBe('Bad.');
  });

  it('a 500 keeps the logged id; a body that is not JSON (a proxy page) gets the message for its status', async () => {
    answer(jsonResponse(500, { error: { code: 'internal', message: 'Something went wrong on our side. Quote reference abc12345 if it persists.', id: 'abc12345' } }));
    const e500 = await failure(api.get('/api/models'));
    expect(e500.id).toBe('abc12345');
    answer(new Response('<html>Bad gateway</html>', { status: 502, headers: { 'content-type': 'text/html' } }));
    const e502 = await failure(api.get('/api/models'));
    expect([e502.status, e502.code]).toEqual([502, 'internal']);
    expect(e502.message).toMatch(/went wrong on our side/);
    answer(new Response('', { status: 404 }));
    expect((await failure(api.get('/api/models/x'))).message).toBe('That was not found. It may have been removed.');
  });

  it('reads what the server mapper writes: status, code, message, fields, retry time and title survive the trip', async () => {
    const schema = z.object({ email: z.email('Enter an e-mail address.') });
    const zodErr = schema.safeParse({ email: 'nope' });
    const sent = [
      validationError(zodErr.error!),
      new AppError('rate_limited', 'Too many snapshot requests from this address.', { retryAfter: 90 }),
      titled('unauthorized', 'Access to this widget has expired', 'Ask the firm to renew the pass.'),
    ];
    for (const e of sent) {
      answer(toErrorResponse(e, 'req-00000001'));
      const got = await failure(api.get('/x'));
      expect(got.status).toBe(e.status);
      expect(got.code).toBe(e.code);
      expect(got.message).toBe(e.message);
      expect(got.fields).toEqual(e.fields);
      expect(got.retryAfter).toBe(e.retryAfter);
      expect(got.title).toBe(e.title);
    }
  });

  it('a titled message splits at its title only', () => {
    const t = new ApiError(401, 'unauthorized', 'Access to this widget has expired. Ask Orrinvale Ltd. to renew the pass.', { title: 'Access to this widget has expired' });
    expect(t.detail).toBe('Ask Orrinvale Ltd. to renew the pass.');
    // Without a title the message stays whole, whatever full stops it holds.
    expect(new ApiError(403, 'forbidden', 'Too many requests. Wait.').detail).toBe('Too many requests. Wait.');
  });
});

describe('429 and Retry-After', () => {
  it('takes the wait from the Retry-After header when the body has none', async () => {
    answer(jsonResponse(429, { error: { code: 'rate_limited', message: 'Too many attempts.' } }, { 'Retry-After': '42' }));
    const err = await failure(api.post('/api/sign-up', {}));
    expect(err.retryAfter).toBe(42);
    expect(errorMessage(err)).toBe('Too many attempts. Try again in 42 seconds.');
  });

  it('prefers the body, and reads an HTTP-date header as seconds from now', async () => {
    answer(jsonResponse(429, { error: { code: 'rate_limited', message: 'Slow down.', retryAfter: 120 } }, { 'Retry-After': '5' }));
    const err = await failure(api.get('/x'));
    expect(err.retryAfter).toBe(120);
    expect(errorMessage(err)).toBe('Slow down. Try again in 2 minutes.');
    const now = Date.parse('2026-12-03T10:00:00Z');
    expect(parseRetryAfter('Thu, 03 Dec 2026 10:01:30 GMT', now)).toBe(90);
    expect(parseRetryAfter('Thu, 03 Dec 2026 09:59:00 GMT', now)).toBeUndefined();
    expect(parseRetryAfter('soon', now)).toBeUndefined();
    expect(parseRetryAfter('0', now)).toBeUndefined();
  });

  it('a 429 without a body still says to wait, with the header’s time', async () => {
    answer(new Response(null, { status: 429, headers: { 'Retry-After': '3' } }));
    const err = await failure(api.get('/x'));
    expect([err.code, err.retryAfter]).toEqual(['rate_limited', 3]);
    expect(errorMessage(err)).toBe('Too many attempts. Wait a moment and try again. Try again in 3 seconds.');
  });
});

describe('network failure', () => {
  it('becomes status 0 with a sentence about the connection', async () => {
    answer(new TypeError('Failed to fetch'));
    const err = await failure(api.get('/api/me'));
    expect([err.status, err.code]).toEqual([0, 'network']);
    expect(err.message).toBe('Could not reach Stochos. Check your connection and try again.');
  });

  it('a caller can word it its own way', async () => {
    answer(new TypeError('Failed to fetch'));
    const err = await failure(requestJson('/x', { networkMessage: 'Offline.' }));
    expect(err.message).toBe('Offline.');
  });
});

describe('requests', () => {
  it('sends JSON with its content type, FormData without one (the browser adds the boundary), and reads 204 as nothing', async () => {
    answer(jsonResponse(200, { ok: 1 }), jsonResponse(201, { id: 'd1' }), new Response(null, { status: 204 }));
    expect(await api.patch('/api/settings', { name: 'A' })).toEqual({ ok: 1 });
    expect((calls[0]!.init.headers as Record<string, string>)['content-type']).toBe('application/json');
    expect(calls[0]!.init.body).toBe('{"name":"A"}');
    expect(calls[0]!.init.credentials).toBe('same-origin');
    const form = new FormData();
    form.set('name', 'Lengths');
    const created = api.post<{ id: string }>('/api/datasets', form);
    expect(await created).toEqual({ id: 'd1' });
    expect((calls[1]!.init.headers as Record<string, string>)['content-type']).toBeUndefined();
    expect(calls[1]!.init.body).toBe(form);
    expect(await api.delete('/api/datasets/d1')).toBeUndefined();
    expect(calls[2]!.init.method).toBe('DELETE');
  });
});

describe('field errors in forms', () => {
  it('puts each message beside its field and returns the rest for the form', () => {
    const placed: [string, string][] = [];
    const setError = ((name: string, e: { message: string }) => placed.push([name, e.message])) as never;
    const err = new ApiError(422, 'validation_failed', 'Some fields need attention.', { fields: { email: ['Enter an e-mail address.'], _: ['Nothing was saved.'], other: ['Odd.'] } });
    expect(applyServerErrors(err, setError, ['email', 'name'])).toEqual(['Nothing was saved.', 'other: Odd.']);
    expect(placed).toEqual([['email', 'Enter an e-mail address.']]);
    expect(applyServerErrors(new ApiError(409, 'conflict', 'Saved by someone else.'), setError, ['email'])).toEqual(['Saved by someone else.']);
  });
});
