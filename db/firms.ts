import 'server-only';
import type { PaperSize, Units } from '@/lib/core/api-types';
import type { Knex } from 'knex';
import { getDb } from '@/db/knex';

export interface Firm {
  id: string;
  name: string;
  unitsDefault: Units;
  currencyDefault: string;
  brandColor: string;
  requireCheck: boolean;
  paperSize: PaperSize;
  createdAt: string;
}

const COLUMNS = ['id', 'name', 'units_default', 'currency_default', 'brand_color', 'require_check', 'paper_size', 'created_at'];

function toFirm(r: Record<string, unknown>): Firm {
  return {
    id: r.id as string,
    name: r.name as string,
    unitsDefault: r.units_default as Units,
    currencyDefault: r.currency_default as string,
    brandColor: r.brand_color as string,
    requireCheck: Boolean(r.require_check),
    paperSize: r.paper_size as PaperSize,
    createdAt: r.created_at as string,
  };
}

export async function getFirm(firmId: string, trx?: Knex.Transaction): Promise<Firm | null> {
  const row = await (trx ?? getDb())('firms').select(COLUMNS).where({ id: firmId }).first();
  return row ? toFirm(row) : null;
}

export interface FirmSettingsPatch {
  name?: string;
  unitsDefault?: string;
  currencyDefault?: string;
  brandColor?: string;
  requireCheck?: boolean;
  paperSize?: 'A4' | 'Letter';
}

export async function updateFirmSettings(firmId: string, patch: FirmSettingsPatch, trx: Knex.Transaction): Promise<void> {
  const row: Record<string, unknown> = {};
  if (patch.name !== undefined) row.name = patch.name;
  if (patch.unitsDefault !== undefined) row.units_default = patch.unitsDefault;
  if (patch.currencyDefault !== undefined) row.currency_default = patch.currencyDefault;
  if (patch.brandColor !== undefined) row.brand_color = patch.brandColor;
  if (patch.requireCheck !== undefined) row.require_check = patch.requireCheck;
  if (patch.paperSize !== undefined) row.paper_size = patch.paperSize;
  if (Object.keys(row).length) await trx('firms').where({ id: firmId }).update(row);
}
