import 'server-only';
import { createHmac, randomUUID } from 'node:crypto';
import { SignJWT, jwtVerify, decodeProtectedHeader, errors } from 'jose';
import { env } from '@/lib/server/env';

// Signed embed tokens (RFC 7519 JWT, HS256 only). Two kinds with distinct audiences so one can never pass for
// the other: the pass token in the integrator's snippet, and the short-lived bearer token the embed page holds
// in memory for its API calls after exchanging the pass.

export const PASS_AUDIENCE = 'stochos-embed';
export const SESSION_AUDIENCE = 'stochos-embed-session';
const ISSUER = 'stochos';
/** The algorithm allow-list: a token announcing any other `alg` (none, RS256, HS512 ...) is refused. */
export const ALGORITHMS = ['HS256'] as const;
export const SESSION_TTL_SECONDS = 30 * 60;

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;

/** Each client's pass tokens are signed with a key derived from the embed secret, the client and its key version. */
function passKey(clientId: string, keyVersion: number): Promise<CryptoKey> {
  return hmacKey(`pass:${clientId}:${keyVersion}`);
}

function sessionKey(): Promise<CryptoKey> {
  return hmacKey('session:v1');
}

// Importing a raw key into WebCrypto costs as much as the signature itself: derived keys are imported once
// per process and label (a key version change gives a new label). A new embed secret empties every cache here.
let cacheSecret: string | null = null;
const keys = new Map<string, Promise<CryptoKey>>();
function hmacKey(label: string): Promise<CryptoKey> {
  checkSecret();
  let k = keys.get(label);
  if (!k) {
    const raw = createHmac('sha256', env().embedSecret).update(label).digest();
    k = crypto.subtle.importKey('raw', raw, { name: 'HMAC', hash: 'SHA-256' }, false, ['sign', 'verify']);
    if (keys.size >= 10_000) keys.clear();
    keys.set(label, k);
  }
  return k;
}

function checkSecret(): void {
  if (cacheSecret === env().embedSecret) return;
  cacheSecret = env().embedSecret;
  keys.clear();
  verifiedPass.clear();
  verifiedSession.clear();
}

/**
 * Verified tokens, by their exact text, one map per kind (so one kind never passes for the other). The signature,
 * audience and issuer of a given string never change, so a token verified once need not be verified again; its
 * expiry is checked on every use, and revocation is checked against the database by the callers as before.
 * Only successes are kept, at most MAX_VERIFIED per kind (oldest dropped first).
 */
const MAX_VERIFIED = 20_000;
type Verified<T> = Map<string, { exp: number; value: T }>;
const verifiedPass: Verified<VerifiedPassToken> = new Map();
const verifiedSession: Verified<SessionClaims & { expiresAt: number }> = new Map();
function remember<T>(map: Verified<T>, token: string, exp: number, value: T): void {
  if (map.size >= MAX_VERIFIED) map.delete(map.keys().next().value!);
  map.set(token, { exp, value });
}
function recall<T>(map: Verified<T>, token: string): T | 'expired' | null {
  checkSecret();
  const hit = map.get(token);
  if (!hit) return null;
  if (hit.exp * 1000 <= Date.now()) {
    map.delete(token);
    return 'expired';
  }
  return hit.value;
}

const seconds = (iso: string) => Math.floor(Date.parse(iso) / 1000);

export interface PassTokenFields {
  passId: string;
  clientId: string;
  keyVersion: number;
  jti: string;
  issuedAt: string;
  expiresAt: string;
}

/**
 * Mints a pass token. HMAC signing is deterministic, so the same stored fields always give the same token:
 * the dashboard shows a pass's snippet again without the token ever being stored.
 */
export async function mintPassToken(f: PassTokenFields): Promise<string> {
  return new SignJWT({})
    .setProtectedHeader({ alg: 'HS256', typ: 'JWT', kid: `${f.clientId}.${f.keyVersion}` })
    .setIssuer(ISSUER)
    .setAudience(PASS_AUDIENCE)
    .setSubject(f.passId)
    .setJti(f.jti)
    .setIssuedAt(seconds(f.issuedAt))
    .setExpirationTime(seconds(f.expiresAt))
    .sign(await passKey(f.clientId, f.keyVersion));
}

export type TokenFailure = 'malformed' | 'invalid' | 'expired';

export interface VerifiedPassToken {
  passId: string;
  clientId: string;
  keyVersion: number;
  jti: string;
  issuedAt: number;
  expiresAt: number;
}

/** What the token claims without checking it: used only to pick the client whose error page may be framed. */
export function peekPassToken(token: string): { passId: string | null; clientId: string | null } {
  try {
    const h = decodeProtectedHeader(token);
    const kid = typeof h.kid === 'string' ? h.kid.split('.') : [];
    const clientId = kid.length === 2 && UUID.test(kid[0]!) ? kid[0]! : null;
    const payload = JSON.parse(Buffer.from(token.split('.')[1] ?? '', 'base64url').toString('utf8')) as { sub?: unknown };
    return { passId: typeof payload.sub === 'string' && UUID.test(payload.sub) ? payload.sub : null, clientId };
  } catch {
    return { passId: null, clientId: null };
  }
}

/** Checks signature, algorithm, audience, issuer and expiry. Revocation and key version are checked against the database by the caller. */
export async function verifyPassToken(token: string): Promise<{ ok: true; token: VerifiedPassToken } | { ok: false; failure: TokenFailure }> {
  if (typeof token !== 'string' || token.length > 2000 || token.split('.').length !== 3) return { ok: false, failure: 'malformed' };
  const known = recall(verifiedPass, token);
  if (known === 'expired') return { ok: false, failure: 'expired' };
  if (known) return { ok: true, token: known };
  let kid: string[];
  try {
    const h = decodeProtectedHeader(token);
    if (h.alg !== 'HS256' || typeof h.kid !== 'string') return { ok: false, failure: 'invalid' };
    kid = h.kid.split('.');
  } catch {
    return { ok: false, failure: 'malformed' };
  }
  const [clientId, kv] = kid;
  const keyVersion = Number(kv);
  if (kid.length !== 2 || !UUID.test(clientId ?? '') || !Number.isInteger(keyVersion) || keyVersion < 1) return { ok: false, failure: 'invalid' };
  try {
    const { payload } = await jwtVerify(token, await passKey(clientId!, keyVersion), {
      algorithms: [...ALGORITHMS],
      audience: PASS_AUDIENCE,
      issuer: ISSUER,
      requiredClaims: ['sub', 'jti', 'iat', 'exp'],
    });
    if (!UUID.test(payload.sub ?? '') || !UUID.test(payload.jti ?? '')) return { ok: false, failure: 'invalid' };
    const verifiedToken: VerifiedPassToken = { passId: payload.sub!, clientId: clientId!, keyVersion, jti: payload.jti!, issuedAt: payload.iat!, expiresAt: payload.exp! };
    remember(verifiedPass, token, payload.exp!, verifiedToken);
    return { ok: true, token: verifiedToken };
  } catch (err) {
    return { ok: false, failure: err instanceof errors.JWTExpired ? 'expired' : 'invalid' };
  }
}

export interface SessionClaims {
  passId: string;
  /** The pass token this session was exchanged from: revoking that token ends the session too. */
  passJti: string;
  keyVersion: number;
  /** The host page origin verified at exchange, or null when the page was opened directly. */
  origin: string | null;
}

export async function mintSessionToken(c: SessionClaims, passExpiresAt: number, now = Date.now()): Promise<{ token: string; expiresAt: number }> {
  const iat = Math.floor(now / 1000);
  const exp = Math.min(iat + SESSION_TTL_SECONDS, passExpiresAt);
  const token = await new SignJWT({ ptj: c.passJti, kv: c.keyVersion, org: c.origin })
    .setProtectedHeader({ alg: 'HS256', typ: 'JWT' })
    .setIssuer(ISSUER)
    .setAudience(SESSION_AUDIENCE)
    .setSubject(c.passId)
    .setJti(randomUUID())
    .setIssuedAt(iat)
    .setExpirationTime(exp)
    .sign(await sessionKey());
  return { token, expiresAt: exp };
}

export async function verifySessionToken(token: string): Promise<{ ok: true; claims: SessionClaims & { expiresAt: number } } | { ok: false; failure: TokenFailure }> {
  if (typeof token !== 'string' || token.length > 2000 || token.split('.').length !== 3) return { ok: false, failure: 'malformed' };
  const known = recall(verifiedSession, token);
  if (known === 'expired') return { ok: false, failure: 'expired' };
  if (known) return { ok: true, claims: known };
  try {
    const { payload } = await jwtVerify(token, await sessionKey(), {
      algorithms: [...ALGORITHMS],
      audience: SESSION_AUDIENCE,
      issuer: ISSUER,
      requiredClaims: ['sub', 'jti', 'iat', 'exp'],
    });
    const { ptj, kv, org } = payload as { ptj?: unknown; kv?: unknown; org?: unknown };
    if (!UUID.test(payload.sub ?? '') || typeof ptj !== 'string' || !UUID.test(ptj) || typeof kv !== 'number' || !(org === null || typeof org === 'string')) {
      return { ok: false, failure: 'invalid' };
    }
    const claims = { passId: payload.sub!, passJti: ptj, keyVersion: kv, origin: org, expiresAt: payload.exp! };
    remember(verifiedSession, token, payload.exp!, claims);
    return { ok: true, claims };
  } catch (err) {
    return { ok: false, failure: err instanceof errors.JWTExpired ? 'expired' : 'invalid' };
  }
}
