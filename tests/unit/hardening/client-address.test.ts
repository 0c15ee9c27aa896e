import { describe, expect, it } from 'vitest';
import { clientAddressFrom, forwardedChain, normaliseAddress, parseTrustedProxies } from '@/lib/server/http/client-address';

// The client address for rate limits: the socket peer, and forwarded headers only as far as trusted proxies vouch.
const headers = (h: Record<string, string>) => (n: string) => h[n] ?? null;

describe('client address', () => {
  const proxies = parseTrustedProxies('10.0.0.0/8, 192.0.2.7 ::1');

  it('is the socket peer when no proxy is trusted, whatever the forwarded headers say', () => {
    const none = parseTrustedProxies('');
    for (let i = 0; i < 5; i++) {
      const h = headers({ 'x-forwarded-for': `203.0.113.${i}`, forwarded: `for=198.51.100.${i}` });
      expect(clientAddressFrom(h, { peer: '::ffff:198.51.100.77', trustedProxies: none })).toBe('198.51.100.77');
    }
  });

  it('walks X-Forwarded-For from the right while the hop is a trusted proxy', () => {
    const h = headers({ 'x-forwarded-for': '1.2.3.4, 203.0.113.9, 10.1.1.1' });
    expect(clientAddressFrom(h, { peer: '192.0.2.7', trustedProxies: proxies, header: 'x-forwarded-for' })).toBe('203.0.113.9');
    // A peer outside the list: its header is ignored.
    expect(clientAddressFrom(h, { peer: '192.0.2.8', trustedProxies: proxies, header: 'x-forwarded-for' })).toBe('192.0.2.8');
    // Only trusted hops: the left-most stands.
    expect(clientAddressFrom(headers({ 'x-forwarded-for': '10.0.0.5, 10.0.0.6' }), { peer: '::1', trustedProxies: proxies, header: 'x-forwarded-for' })).toBe('10.0.0.5');
    // An unreadable entry ends the walk at the last address a trusted proxy vouched for.
    expect(clientAddressFrom(headers({ 'x-forwarded-for': 'evil, 10.0.0.6' }), { peer: '10.0.0.1', trustedProxies: proxies, header: 'x-forwarded-for' })).toBe('10.0.0.6');
  });

  it('reads RFC 7239 Forwarded when configured, with quoted IPv6 and ports', () => {
    const h = headers({ forwarded: 'for=1.2.3.4;proto=https, for="[2001:db8::17]:4711";by=10.0.0.1', 'x-forwarded-for': '5.6.7.8' });
    expect(clientAddressFrom(h, { peer: '10.0.0.1', trustedProxies: proxies, header: 'forwarded' })).toBe('2001:db8::17');
    expect(forwardedChain('forwarded', 'for=unknown, for=_hidden, for=192.0.2.1:80')).toEqual([null, null, '192.0.2.1']);
  });

  it('without the stamped socket peer every request shares one bucket', () => {
    expect(clientAddressFrom(headers({ 'x-forwarded-for': '1.2.3.4', 'x-stochos-peer': '1.2.3.4' }), { peer: null, trustedProxies: proxies })).toBe('unknown');
  });

  it('normalises addresses and refuses a bad TRUSTED_PROXIES entry by name', () => {
    expect(normaliseAddress('::FFFF:192.0.2.1')).toBe('192.0.2.1');
    expect(normaliseAddress('[::1]:3000')).toBe('::1');
    expect(normaliseAddress('192.0.2.1:8080')).toBe('192.0.2.1');
    expect(normaliseAddress('example.com')).toBeNull();
    expect(() => parseTrustedProxies('10.0.0.0/8, proxy.internal')).toThrow(/"proxy\.internal" is not an IP address or CIDR range/);
    expect(() => parseTrustedProxies('10.0.0.0/33')).toThrow(/"10\.0\.0\.0\/33"/);
  });
});

describe('TRUSTED_PROXIES at start-up', () => {
  it('a bad entry stops start-up with its name', async () => {
    const { env, resetEnvCache } = await import('@/lib/server/env');
    const before = process.env.TRUSTED_PROXIES;
    try {
      process.env.TRUSTED_PROXIES = '10.0.0.0/8, lb.internal';
      resetEnvCache();
      expect(() => env()).toThrow(/TRUSTED_PROXIES: "lb\.internal" is not an IP address or CIDR range/);
      process.env.TRUSTED_PROXIES = '10.0.0.0/8, 2001:db8::/32';
      resetEnvCache();
      expect(env().TRUSTED_PROXIES).toBe('10.0.0.0/8, 2001:db8::/32');
    } finally {
      if (before === undefined) delete process.env.TRUSTED_PROXIES;
      else process.env.TRUSTED_PROXIES = before;
      resetEnvCache();
    }
  });
});
