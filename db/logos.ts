import 'server-only';
import type { Knex } from 'knex';
import { getDb } from '@/db/knex';
import { nowIso } from '@/db/ids';

// The firm's logo: only re-encoded bytes are stored (never the uploaded file).

export interface FirmLogo {
  bytes: Buffer;
  contentType: string;
  hash: string;
  width: number;
  height: number;
  updatedAt: string;
}

export async function getLogo(firmId: string): Promise<FirmLogo | null> {
  const r = await getDb()('firm_logos').where({ firm_id: firmId }).first('bytes', 'content_type', 'hash', 'width', 'height', 'updated_at');
  if (!r) return null;
  return { bytes: Buffer.from(r.bytes as Uint8Array), contentType: r.content_type, hash: r.hash, width: Number(r.width), height: Number(r.height), updatedAt: r.updated_at };
}

export async function putLogo(
  firmId: string,
  userId: string,
  logo: { bytes: Buffer; contentType: string; hash: string; width: number; height: number },
  trx?: Knex.Transaction,
): Promise<void> {
  const row = { bytes: logo.bytes, content_type: logo.contentType, hash: logo.hash, width: logo.width, height: logo.height, updated_by: userId, updated_at: nowIso() };
  await (trx ?? getDb())('firm_logos').insert({ firm_id: firmId, ...row }).onConflict('firm_id').merge(row);
}

export async function deleteLogo(firmId: string, trx?: Knex.Transaction): Promise<boolean> {
  return (await (trx ?? getDb())('firm_logos').where({ firm_id: firmId }).delete()) > 0;
}
