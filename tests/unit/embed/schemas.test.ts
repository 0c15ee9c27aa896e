import { describe, it, expect } from 'vitest';
import { normaliseOrigin, normaliseEmailDomain, clientCreateSchema, passCreateSchema, passRenewSchema, splitLines } from '@/lib/core/embed/schemas';

// Origins as browsers serialise them: scheme "://" host [":" port] (RFC 6454 §6.1; HTML "serialization of an origin").
describe('allowed origins', () => {
  it('accepts exact origins and normalises case, a default port and one trailing slash', () => {
    expect(normaliseOrigin('https://portal.northfield.example')).toEqual({ ok: true, origin: 'https://portal.northfield.example' });
    expect(normaliseOrigin('  HTTPS://Portal.Northfield.Example/ ')).toEqual({ ok: true, origin: 'https://portal.northfield.example' });
    expect(normaliseOrigin('https://portal.northfield.example:443')).toEqual({ ok: true, origin: 'https://portal.northfield.example' });
    expect(normaliseOrigin('http://localhost:4100')).toEqual({ ok: true, origin: 'http://localhost:4100' });
    expect(normaliseOrigin('http://127.0.0.1:8080')).toEqual({ ok: true, origin: 'http://127.0.0.1:8080' });
    expect(normaliseOrigin('http://[::1]:3000')).toEqual({ ok: true, origin: 'http://[::1]:3000' });
  });

  it.each([
    ['portal.northfield.example', /start with http/],
    ['https://portal.northfield.example/projects', /origin only/],
    ['https://portal.northfield.example/?a=1', /origin only/],
    ['https://portal.northfield.example#top', /origin only/],
    ['https://*.northfield.example', /wildcards/],
    ['ftp://files.northfield.example', /only http/],
    ['javascript://alert(1)', /origin only|only http/],
    ['https://user:pw@portal.northfield.example', /user name/],
    ['https://', /host name is missing/],
    ['https://portal.northfield.example:99999', /not a valid web address/],
    ['https://portal.northfield.example:', /port number is missing/],
    ['https://bad_host.example', /not a valid host name/],
    ['null', /start with http/],
    ['', /Enter an origin/],
  ])('refuses %s', (input, message) => {
    const r = normaliseOrigin(input);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(message);
  });
});

describe('allowed e-mail domains', () => {
  it('accepts bare domains in lower case', () => {
    expect(normaliseEmailDomain('Northfield-Pumps.example')).toEqual({ ok: true, domain: 'northfield-pumps.example' });
    expect(normaliseEmailDomain('mail.co.example')).toEqual({ ok: true, domain: 'mail.co.example' });
  });
  it.each([
    ['someone@northfield.example', /domain only/],
    ['https://northfield.example', /bare domain/],
    ['*.northfield.example', /wildcards/],
    ['localhost', /not a valid e-mail domain/],
    ['north field.example', /not a valid e-mail domain/],
    ['-bad.example', /not a valid e-mail domain/],
  ])('refuses %s', (input, message) => {
    const r = normaliseEmailDomain(input);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(message);
  });
});

describe('client form schema', () => {
  it('normalises and de-duplicates lists', () => {
    const r = clientCreateSchema.parse({ name: ' Northfield ', allowedOrigins: ['https://a.example/', 'https://A.example'], allowedEmailDomains: ['X.example', 'x.example'] });
    expect(r).toEqual({ name: 'Northfield', allowedOrigins: ['https://a.example'], allowedEmailDomains: ['x.example'], snapshotAnyAddress: false });
  });
  it('points at the bad list item and needs one origin', () => {
    const r = clientCreateSchema.safeParse({ name: 'N', allowedOrigins: ['https://ok.example', 'https://ok.example/path'], allowedEmailDomains: ['a@b.example'] });
    expect(r.success).toBe(false);
    const paths = r.error!.issues.map((i) => i.path.join('.'));
    expect(paths).toEqual(expect.arrayContaining(['name', 'allowedOrigins.1', 'allowedEmailDomains.0']));
    const none = clientCreateSchema.safeParse({ name: 'Northfield', allowedOrigins: [] });
    expect(none.error!.issues[0]!.message).toMatch(/at least one allowed origin/);
  });
  it('refuses unknown fields', () => {
    expect(clientCreateSchema.safeParse({ name: 'Northfield', allowedOrigins: ['https://a.example'], keyVersion: 7 }).success).toBe(false);
  });
});

describe('pass schemas', () => {
  it('defaults to 90 days and bounds the length', () => {
    const id = '6f1c1f43-3d2e-4f55-9d55-0a5f7c3f2b10';
    expect(passCreateSchema.parse({ clientId: id, widgetId: id }).days).toBe(90);
    expect(passCreateSchema.safeParse({ clientId: id, widgetId: id, days: 0 }).success).toBe(false);
    expect(passCreateSchema.safeParse({ clientId: id, widgetId: id, days: 400 }).success).toBe(false);
    expect(passCreateSchema.safeParse({ clientId: 'nope', widgetId: id }).success).toBe(false);
    expect(passRenewSchema.parse({})).toEqual({ days: 90, retirePrevious: false });
  });
  it('splits textarea lines and commas', () => {
    expect(splitLines(' https://a.example\n\nhttps://b.example , https://c.example ')).toEqual(['https://a.example', 'https://b.example', 'https://c.example']);
  });
});
