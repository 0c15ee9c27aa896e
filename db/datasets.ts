import 'server-only';
import type { DatasetRecord, DatasetRow } from '@/lib/core/api-types';
import type { Knex } from 'knex';
import { getDb } from '@/db/knex';
import { newId, nowIso } from '@/db/ids';

// The firm's dataset library. Datasets are immutable once stored: a re-upload is a new dataset with its own hash.

type Db = Knex | Knex.Transaction;
const db = (trx?: Knex.Transaction): Db => trx ?? getDb();

export type { DatasetRow, DatasetRecord };

const COLUMNS = [
  'd.id',
  'd.name',
  'd.unit',
  'd.column_name',
  'd.file_name',
  'd.hash',
  'd.size_bytes',
  'd.row_count',
  'd.dropped_rows',
  'd.uploaded_by',
  'd.created_at',
  'u.name as uploaded_by_name',
];

const countOfUses = (k: Db) =>
  k('dataset_uses as du')
    .join('models as m', 'm.id', 'du.model_id')
    .whereRaw('du.dataset_id = d.id')
    .whereNull('m.archived_at')
    .countDistinct('du.model_id')
    .as('use_count');

function toRow(r: Record<string, unknown>): DatasetRow {
  return {
    id: r.id as string,
    name: r.name as string,
    unit: r.unit as string,
    columnName: r.column_name as string,
    fileName: r.file_name as string,
    hash: r.hash as string,
    sizeBytes: Number(r.size_bytes),
    rowCount: Number(r.row_count),
    droppedRows: JSON.parse(r.dropped_rows as string) as number[],
    uploadedBy: (r.uploaded_by as string | null) ?? null,
    uploadedByName: (r.uploaded_by_name as string | null) ?? null,
    createdAt: r.created_at as string,
    useCount: Number(r.use_count ?? 0),
  };
}

export async function listDatasets(firmId: string): Promise<DatasetRow[]> {
  const k = getDb();
  const rows = await k('datasets as d')
    .leftJoin('users as u', 'u.id', 'd.uploaded_by')
    .where('d.firm_id', firmId)
    .whereNull('d.archived_at')
    .select([...COLUMNS, countOfUses(k)])
    .orderBy('d.created_at', 'desc');
  return rows.map(toRow);
}

export async function getDataset(firmId: string, id: string, trx?: Knex.Transaction): Promise<DatasetRecord | null> {
  const k = db(trx);
  const r = await k('datasets as d')
    .leftJoin('users as u', 'u.id', 'd.uploaded_by')
    .where({ 'd.firm_id': firmId, 'd.id': id })
    .whereNull('d.archived_at')
    .first([...COLUMNS, 'd.values_json', countOfUses(k)]);
  if (!r) return null;
  return { ...toRow(r), values: JSON.parse(r.values_json as string) as number[] };
}

export interface NewDataset {
  name: string;
  unit: string;
  columnName: string;
  fileName: string;
  values: number[];
  hash: string;
  sizeBytes: number;
  rowCount: number;
  droppedRows: number[];
}

export async function insertDataset(firmId: string, userId: string | null, d: NewDataset, trx?: Knex.Transaction): Promise<string> {
  const id = newId();
  await db(trx)('datasets').insert({
    id,
    firm_id: firmId,
    name: d.name,
    unit: d.unit,
    column_name: d.columnName,
    file_name: d.fileName,
    values_json: JSON.stringify(d.values),
    hash: d.hash,
    size_bytes: d.sizeBytes,
    row_count: d.rowCount,
    dropped_rows: JSON.stringify(d.droppedRows),
    uploaded_by: userId,
    created_at: nowIso(),
  });
  return id;
}

/** Models (not archived) that used the dataset, for the delete warning. */
export async function modelsUsingDataset(firmId: string, datasetId: string, trx?: Knex.Transaction): Promise<{ id: string; title: string }[]> {
  return db(trx)('dataset_uses as du')
    .join('models as m', 'm.id', 'du.model_id')
    .where({ 'du.firm_id': firmId, 'du.dataset_id': datasetId })
    .whereNull('m.archived_at')
    .distinct('m.id', 'm.title')
    .orderBy('m.title');
}

/** Archiving keeps provenance rows intact: versions that copied the data keep naming it. */
export async function archiveDataset(firmId: string, id: string, trx?: Knex.Transaction): Promise<boolean> {
  const n = await db(trx)('datasets').where({ firm_id: firmId, id }).whereNull('archived_at').update({ archived_at: nowIso() });
  return n > 0;
}

export async function recordDatasetUse(
  firmId: string,
  use: { datasetId: string; modelId: string; hash: string; method: string; userId: string | null },
  trx?: Knex.Transaction,
): Promise<string> {
  const id = newId();
  await db(trx)('dataset_uses').insert({
    id,
    firm_id: firmId,
    dataset_id: use.datasetId,
    model_id: use.modelId,
    hash: use.hash,
    method: use.method,
    created_by: use.userId,
    created_at: nowIso(),
  });
  return id;
}

export interface DatasetUse {
  datasetId: string;
  datasetName: string;
  hash: string;
  method: string;
  createdAt: string;
}

/** Provenance of a model's inputs: which datasets (and which hash of each) it copied. */
export async function usesForModel(firmId: string, modelId: string): Promise<DatasetUse[]> {
  const rows = await getDb()('dataset_uses as du')
    .join('datasets as d', 'd.id', 'du.dataset_id')
    .where({ 'du.firm_id': firmId, 'du.model_id': modelId })
    .select('du.dataset_id', 'd.name', 'du.hash', 'du.method', 'du.created_at')
    .orderBy('du.created_at', 'desc');
  return rows.map((r) => ({ datasetId: r.dataset_id, datasetName: r.name, hash: r.hash, method: r.method, createdAt: r.created_at }));
}
