import 'server-only';
import { prepared } from '@/db/prepared';
import { toClient, type ClientRecord } from '@/db/clients';
import type { PassTokenRow, RevokeReason } from '@/db/passes';

// The embed read path's one query: a pass, its client and one of its tokens, by pass id and token id. It runs on
// every widget read and pass exchange, so it reads only what the access rules need (no view counts).

export interface EmbedPass {
  id: string;
  firmId: string;
  clientId: string;
  widgetId: string;
  revokedAt: string | null;
  revokeReason: RevokeReason | null;
}

export interface EmbedAccessRow {
  pass: EmbedPass;
  /** The pass's client (null only if the row is gone). */
  client: ClientRecord | null;
  /** The token with the given id, whichever pass it belongs to (the caller compares). */
  token: PassTokenRow | null;
}

const CLIENT = ['id', 'firm_id', 'name', 'note', 'allowed_origins', 'allowed_email_domains', 'snapshot_any_address', 'key_version', 'not_before', 'created_at', 'updated_at', 'archived_at'];
const TOKEN = ['jti', 'pass_id', 'key_version', 'issued_at', 'expires_at', 'revoked_at'];

const pick = (r: Record<string, unknown>, prefix: string, cols: string[]) => Object.fromEntries(cols.map((c) => [c, r[prefix + c]]));

const accessQuery = prepared<'passId' | 'jti'>((db, param) =>
  db('passes as p')
    .leftJoin('clients as c', 'c.id', 'p.client_id')
    .leftJoin('pass_tokens as t', (j) => j.onVal('t.jti', '=', param('jti')))
    .where('p.id', param('passId'))
    .select(['p.id', 'p.firm_id', 'p.client_id', 'p.widget_id', 'p.revoked_at', 'p.revoke_reason', ...CLIENT.map((c) => `c.${c} as c_${c}`), ...TOKEN.map((c) => `t.${c} as t_${c}`)])
    .limit(1),
);

export async function getEmbedAccess(passId: string, jti: string): Promise<EmbedAccessRow | null> {
  const r = (await accessQuery({ passId, jti }))[0];
  if (!r) return null;
  return {
    pass: {
      id: r.id as string,
      firmId: r.firm_id as string,
      clientId: r.client_id as string,
      widgetId: r.widget_id as string,
      revokedAt: (r.revoked_at as string | null) ?? null,
      revokeReason: (r.revoke_reason as RevokeReason | null) ?? null,
    },
    client: r.c_id ? toClient(pick(r, 'c_', CLIENT)) : null,
    token: r.t_jti
      ? {
          jti: r.t_jti as string,
          passId: r.t_pass_id as string,
          keyVersion: Number(r.t_key_version),
          issuedAt: r.t_issued_at as string,
          expiresAt: r.t_expires_at as string,
          revokedAt: (r.t_revoked_at as string | null) ?? null,
        }
      : null,
  };
}
