import { describe, expect, it } from 'vitest';
import { contentSecurityPolicy, hstsHeader, newNonce } from '@/lib/server/http/csp';

// The page policy (CSP Level 3, W3C): directives by name.
const directives = (csp: string) => Object.fromEntries(csp.split('; ').map((d) => [d.split(' ')[0], d.split(' ').slice(1).join(' ')]));

describe('content security policy', () => {
  it('an https deployment: nonce scripts, forms to itself only, HSTS and upgrade-insecure-requests', () => {
    const d = directives(contentSecurityPolicy({ nonce: 'abc', appUrl: 'https://stochos.example', development: false }));
    expect(d['default-src']).toBe("'self'");
    expect(d['script-src']).toBe("'self' 'nonce-abc'");
    expect(d['form-action']).toBe("'self' https://stochos.example");
    expect(d['frame-ancestors']).toBe("'none'");
    expect(d['object-src']).toBe("'none'");
    expect('upgrade-insecure-requests' in d).toBe(true);
    expect(hstsHeader('https://stochos.example', false)).toBe('max-age=31536000; includeSubDomains');
  });

  it('a local http stack keeps localhost form targets and gets no HSTS; development allows eval', () => {
    const local = directives(contentSecurityPolicy({ nonce: 'n', appUrl: 'http://localhost:3000', development: false }));
    expect(local['form-action']).toMatch(/http:\/\/localhost:\*/);
    expect('upgrade-insecure-requests' in local).toBe(false);
    expect(hstsHeader('http://localhost:3000', false)).toBeNull();
    expect(directives(contentSecurityPolicy({ nonce: 'n', appUrl: 'http://localhost:3000', development: true }))['script-src']).toContain("'unsafe-eval'");
  });

  it('nonces are fresh and carry 128 bits', () => {
    const a = newNonce();
    expect(Buffer.from(a, 'base64')).toHaveLength(16);
    expect(newNonce()).not.toBe(a);
  });
});
