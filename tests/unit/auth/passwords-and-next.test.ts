import { describe, it, expect } from 'vitest';
import bcrypt from 'bcryptjs';
import { passwordField, signUpSchema, utf8Length } from '@/lib/core/auth/schemas';
import { safeNext } from '@/lib/core/auth/next-path';

const ORIGIN = 'http://localhost:3000';

describe('safeNext: where sign-in may lead', () => {
  it('refuses paths the URL parser turns into another origin', () => {
    // The tab is stripped by the URL parser, leaving //evil.example (a host).
    expect(safeNext('/\t/evil.example', ORIGIN)).toBe('/app');
    expect(safeNext(decodeURIComponent('/%09/evil.example'), ORIGIN)).toBe('/app');
    expect(safeNext('/\n/evil.example', ORIGIN)).toBe('/app');
    expect(safeNext('//evil.example', ORIGIN)).toBe('/app');
    expect(safeNext('/\\evil.example', ORIGIN)).toBe('/app');
    expect(safeNext('https://evil.example/app', ORIGIN)).toBe('/app');
    expect(safeNext('https://localhost:3000/app', ORIGIN)).toBe('/app');
    expect(safeNext('javascript:alert(1)', ORIGIN)).toBe('/app');
    // Normalises to a path that starts with two slashes.
    expect(safeNext('/.//evil.example', ORIGIN)).toBe('/app');
    expect(safeNext(42, ORIGIN)).toBe('/app');
  });

  it('keeps the app’s own paths, query and fragment', () => {
    expect(safeNext('/app/models?tab=versions#v2', ORIGIN)).toBe('/app/models?tab=versions#v2');
    expect(safeNext('http://localhost:3000/app/team', ORIGIN)).toBe('/app/team');
  });
});

describe('passwords: bcrypt reads 72 bytes', () => {
  it('bcrypt itself ignores everything after byte 72 (why the limit exists)', async () => {
    const a = 'x'.repeat(72) + 'first ending';
    const hash = await bcrypt.hash(a, 4);
    expect(await bcrypt.compare('x'.repeat(72) + 'another ending', hash)).toBe(true);
  });

  it('accepts 72 plain letters and refuses 73, with a message that says bytes', () => {
    expect(passwordField.safeParse('a'.repeat(72)).success).toBe(true);
    const r = passwordField.safeParse('a'.repeat(73));
    expect(r.success).toBe(false);
    expect(r.error!.issues[0]!.message).toMatch(/72 bytes/);
  });

  it('counts UTF-8 bytes, not characters', () => {
    const accented = 'é'.repeat(37); // 37 characters, 74 bytes
    expect(accented.length).toBe(37);
    expect(utf8Length(accented)).toBe(74);
    expect(passwordField.safeParse(accented).success).toBe(false);
    expect(passwordField.safeParse('é'.repeat(36)).success).toBe(true);
    const r = signUpSchema.safeParse({ firmName: 'Firm', name: 'N', email: 'a@b.example', password: '🔩'.repeat(19) });
    expect(r.success).toBe(false);
    expect(r.error!.issues.map((i) => i.path.join('.'))).toEqual(['password']);
  });
});
