import 'server-only';
import type { ClientRecord } from '@/db/clients';
import { getEmbedAccess, type EmbedAccessRow, type EmbedPass } from '@/db/embed-access';
import { getPublishedWidgetMeta, type PublishedWidget } from '@/db/widgets';
import { getFirm } from '@/db/firms';
import { versionModel } from '@/lib/server/embed/model-cache';
import { AppError, titled } from '@/lib/server/http/errors';
import { peekPassToken, verifyPassToken, verifySessionToken, type SessionClaims } from '@/lib/server/embed/tokens';
import { viewerMessage, type AccessFailure } from '@/lib/server/embed/messages';

// Who may see an embedded widget. Every check reads the database, so a revocation, a key rotation or an
// archived client takes effect on the very next page load or API call. Two queries per check: the pass with its
// client and token, then the published widget; the version's model comes from a cache (versions are immutable).

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;

export interface Granted {
  ok: true;
  pass: EmbedPass;
  client: ClientRecord;
  widget: PublishedWidget;
  /** The hash of the firm's logo when it has one (for the logo's cache-busting address). */
  logoHash: string | null;
  passJti: string;
  passExpiresAt: number;
}

export interface Refused {
  ok: false;
  failure: AccessFailure;
  /** The client whose origins may frame the refusal message (a page with no data), when one is known. */
  client: ClientRecord | null;
  firmName: string | null;
}

async function refused(failure: AccessFailure, client: ClientRecord | null): Promise<Refused> {
  const firm = client ? await getFirm(client.firmId) : null;
  return { ok: false, failure, client, firmName: firm?.name ?? null };
}

/** Common checks once the pass, client and token id are known. */
async function checkState(a: EmbedAccessRow | null, clientId: string, keyVersion: number, issuedAtSec: number, jti: string): Promise<Granted | Refused> {
  const pass = a?.pass;
  if (!a || !pass || pass.clientId !== clientId) return refused('invalid', null);
  const client = a.client;
  if (!client || client.firmId !== pass.firmId) return refused('invalid', null);
  const row = a.token;
  if (!row || row.passId !== pass.id) return refused('invalid', client);
  if (pass.revokedAt) return refused(pass.revokeReason === 'key_rotated' ? 'rotated' : 'revoked', client);
  if (keyVersion !== client.keyVersion || issuedAtSec < Math.floor(Date.parse(client.notBefore) / 1000)) return refused('rotated', client);
  if (row.revokedAt) return refused('revoked', client);
  if (Date.parse(row.expiresAt) <= Date.now()) return refused('expired', client);
  if (client.archivedAt) return refused('archived', client);
  const meta = await getPublishedWidgetMeta(pass.firmId, pass.widgetId);
  const model = meta ? await versionModel(pass.firmId, meta.versionId) : null;
  if (!meta || model === null) return refused('unpublished', client);
  const { logoHash, ...widget } = meta;
  return { ok: true, pass, client, widget: { ...widget, model }, logoHash, passJti: jti, passExpiresAt: Math.floor(Date.parse(row.expiresAt) / 1000) };
}

/** The pass from a snippet (the embed page and the exchange). `passId` is the id the snippet names. */
export async function checkPass(passId: string | null | undefined, token: string | null | undefined): Promise<Granted | Refused> {
  if (!token) return refused('missing', null);
  // For refusals, the client named by the (possibly forged) token only decides who may frame a message page.
  const peekClient = async () => {
    const peek = peekPassToken(token);
    if (!peek.passId || !peek.clientId) return null;
    const a = await getEmbedAccess(peek.passId, '');
    return a && a.pass.clientId === peek.clientId ? a.client : null;
  };
  const v = await verifyPassToken(token);
  if (!v.ok) return refused(v.failure, await peekClient());
  if (!passId || !UUID.test(passId) || passId !== v.token.passId) return refused('mismatch', await peekClient());
  return checkState(await getEmbedAccess(v.token.passId, v.token.jti), v.token.clientId, v.token.keyVersion, v.token.issuedAt, v.token.jti);
}

export interface Framable {
  ok: true;
  pass: EmbedPass;
  client: ClientRecord;
  firmName: string | null;
}

/**
 * The embed page's own check, by pass id alone: the pass token never travels in a URL (the loader hands it to
 * the frame by postMessage, a direct link carries it in the fragment), so the page knows only which pass it
 * shows. Pass-wide states (unknown, revoked, suspended, unpublished) are answered here; the token's own checks
 * (signature, key, expiry) happen at the exchange (POST /api/embed/session). The page shows no widget data.
 */
export async function checkPassFrame(passId: string | null | undefined): Promise<Framable | Refused> {
  if (!passId || !UUID.test(passId)) return refused('invalid', null);
  const a = await getEmbedAccess(passId, '');
  const client = a?.client;
  if (!a || !client || client.firmId !== a.pass.firmId) return refused('invalid', null);
  if (a.pass.revokedAt) return refused(a.pass.revokeReason === 'key_rotated' ? 'rotated' : 'revoked', client);
  if (client.archivedAt) return refused('archived', client);
  if (!(await getPublishedWidgetMeta(a.pass.firmId, a.pass.widgetId))) return refused('unpublished', client);
  return { ok: true, pass: a.pass, client, firmName: (await getFirm(client.firmId))?.name ?? null };
}

export interface Viewer extends Granted {
  session: SessionClaims;
}

/**
 * Route handlers of the embed API: the bearer token from the exchange, for the pass named in the path.
 * 401 when the token is missing, forged, expired or its pass no longer works; 403 when it is for another pass.
 */
export async function requireViewer(req: Request, passId: string): Promise<Viewer> {
  const header = req.headers.get('authorization') ?? '';
  const m = /^Bearer\s+([A-Za-z0-9_.-]+)$/.exec(header);
  if (!m) throw titled('unauthorized', 'This widget needs its access token', 'Reload the page.');
  const v = await verifySessionToken(m[1]!);
  if (!v.ok) {
    throw v.failure === 'expired' ? titled('unauthorized', 'The viewing session has ended', 'Reload the page to continue.') : titled('unauthorized', 'The access token is not valid', 'Reload the page.');
  }
  if (!UUID.test(passId) || v.claims.passId !== passId) throw new AppError('forbidden', 'This access token was issued for another widget.');
  const a = await getEmbedAccess(passId, v.claims.passJti);
  const r = a?.token ? await checkState(a, a.pass.clientId, v.claims.keyVersion, Math.floor(Date.parse(a.token.issuedAt) / 1000), v.claims.passJti) : await refused('invalid', null);
  if (!r.ok) throw new AppError('unauthorized', viewerMessage(r.failure, r.firmName).title + '.');
  return { ...r, session: v.claims };
}
