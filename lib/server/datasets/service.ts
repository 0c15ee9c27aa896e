import 'server-only';
import type { DatasetCreated, DatasetDetail, DatasetUseRecorded } from '@/lib/core/api-types';
import { createHash } from 'node:crypto';
import { z } from 'zod';
import { AppError, notFound } from '@/lib/server/http/errors';
import { readForm } from '@/lib/server/http/handler';
import { writeTransaction } from '@/db/knex';
import { recordAudit } from '@/db/audit';
import { archiveDataset, getDataset, insertDataset, listDatasets, modelsUsingDataset, recordDatasetUse, type DatasetRow } from '@/db/datasets';
import { getModel } from '@/db/models';
import type { Member } from '@/lib/server/auth/guard';
import { columnError, MAX_UPLOAD_BYTES, readColumn, readCsv } from '@/lib/core/datasets/csv';
import { CRITICAL_VALUE_NOTE, fitAll, TooFewValuesError, type FitResult } from '@/lib/core/datasets/fit';
import { summarise } from '@/lib/core/datasets/summary';
import { LAWS } from '@/lib/core/datasets/fit';
import { datasetCsv } from './export';

export const uploadFieldsSchema = z.object({
  name: z.string().trim().min(1, 'Name the dataset.').max(120, 'The name is at most 120 characters.'),
  unit: z.string().trim().max(24, 'The unit is at most 24 characters.').default(''),
  column: z.coerce.number({ error: 'Choose the column.' }).int('Choose the column.').min(0, 'Choose the column.'),
  drop: z
    .string()
    .default('')
    .transform((s) => s.split(/[\s,]+/).filter(Boolean).map(Number))
    .refine((a) => a.every((n) => Number.isInteger(n) && n > 0), { error: 'Rows to drop are row numbers, e.g. "3, 7".' }),
});

const fail = (field: string, message: string) => new AppError('validation_failed', message, { fields: { [field]: [message] } });

/** Reads a multipart upload (a file, or a pasted column as `text`), checks it all, and stores it; nothing is stored on any failure. */
export async function uploadDataset(m: Member, req: Request): Promise<DatasetCreated> {
  const type = req.headers.get('content-type') ?? '';
  if (!type.startsWith('multipart/form-data')) throw new AppError('unsupported_media_type', 'Send the upload as multipart/form-data (a file or a pasted column).');
  // The file may be 5 MB; the form around it gets 64 KiB more. Bytes are counted as they arrive (413 beyond).
  const form = await readForm(req, MAX_UPLOAD_BYTES + 64 * 1024);
  const fields = uploadFieldsSchema.parse({
    name: form.get('name') ?? '',
    unit: form.get('unit') ?? '',
    column: form.get('column') ?? 0,
    drop: form.get('drop') ?? '',
  });
  const file = form.get('file');
  const pasted = form.get('text');
  let bytes: Uint8Array;
  let fileName: string;
  if (file && typeof file !== 'string') {
    bytes = new Uint8Array(await file.arrayBuffer());
    fileName = (file.name || 'upload.csv').slice(0, 255);
  } else if (typeof pasted === 'string') {
    bytes = new TextEncoder().encode(pasted);
    fileName = 'Pasted column';
  } else {
    throw fail('file', 'Choose a CSV file or paste a column of numbers.');
  }
  const read = readCsv(bytes, fileName);
  if (!read.ok) throw fail('file', read.message);
  const { table } = read;
  if (fields.column >= table.headers.length) throw fail('column', `${fileName} has ${table.headers.length} column(s); choose one of them.`);
  const header = table.headers[fields.column];
  const col = readColumn(table, fields.column, fields.drop);
  const err = columnError(fileName, header, col);
  if (err) throw fail(col.problems.length ? 'drop' : 'column', err);
  const hash = createHash('sha256').update(bytes).digest('hex');
  const id = await writeTransaction(async (trx) => {
    const id = await insertDataset(
      m.firmId,
      m.userId,
      { name: fields.name, unit: fields.unit, columnName: header, fileName, values: col.values, hash, sizeBytes: bytes.length, rowCount: col.values.length, droppedRows: col.dropped },
      trx,
    );
    await recordAudit({ firmId: m.firmId, actorUserId: m.userId, action: 'dataset.uploaded', targetType: 'dataset', targetId: id, detail: { name: fields.name, hash, rows: col.values.length, dropped: col.dropped } }, trx);
    return id;
  });
  return { id };
}

export type { DatasetDetail };

export function fitDataset(values: number[]): { fits: FitResult[] | null; fitRefused: string | null } {
  try {
    return { fits: fitAll(values, { laws: LAWS }), fitRefused: null };
  } catch (err) {
    if (err instanceof TooFewValuesError) return { fits: null, fitRefused: err.message };
    throw err;
  }
}

export async function datasetDetail(m: Member, id: string): Promise<DatasetDetail> {
  const ds = await getDataset(m.firmId, id);
  if (!ds) throw notFound('That dataset');
  return { dataset: ds, summary: summarise(ds.values), ...fitDataset(ds.values), criticalValueNote: CRITICAL_VALUE_NOTE, usedBy: await modelsUsingDataset(m.firmId, id) };
}

/** Deleting a dataset in use needs `confirm`: the first call answers 409 naming the models. */
export async function deleteDataset(m: Member, id: string, confirm: boolean): Promise<void> {
  await writeTransaction(async (trx) => {
    const ds = await getDataset(m.firmId, id, trx);
    if (!ds) throw notFound('That dataset');
    const users = await modelsUsingDataset(m.firmId, id, trx);
    if (users.length && !confirm) {
      throw new AppError('conflict', `"${ds.name}" is used by ${users.length} model(s): ${users.map((u) => u.title).join(', ')}. Their versions keep the copied values; confirm to delete the dataset anyway.`);
    }
    await archiveDataset(m.firmId, id, trx);
    await recordAudit({ firmId: m.firmId, actorUserId: m.userId, action: 'dataset.deleted', targetType: 'dataset', targetId: id, detail: { name: ds.name, hash: ds.hash, usedBy: users.map((u) => u.id) } }, trx);
  });
}

export const useSchema = z.object({
  modelId: z.uuid('Choose the model that uses the dataset.'),
  method: z.enum(['empirical', ...LAWS], { error: 'Say how the model uses the dataset: empirical or a fitted law.' }),
});

export async function recordUse(m: Member, id: string, body: z.infer<typeof useSchema>): Promise<DatasetUseRecorded> {
  return writeTransaction(async (trx) => {
    const ds = await getDataset(m.firmId, id, trx);
    if (!ds) throw notFound('That dataset');
    const model = await getModel(m.firmId, body.modelId, trx);
    if (!model) throw notFound('That model');
    const useId = await recordDatasetUse(m.firmId, { datasetId: id, modelId: body.modelId, hash: ds.hash, method: body.method, userId: m.userId }, trx);
    return { id: useId, hash: ds.hash };
  });
}

export const datasetList = (m: Member): Promise<DatasetRow[]> => listDatasets(m.firmId);

/** The dataset as a CSV download: its file name (from the dataset's name) and contents. */
export async function datasetExport(m: Member, id: string): Promise<{ fileName: string; csv: string }> {
  const ds = await getDataset(m.firmId, id);
  if (!ds) throw notFound('That dataset');
  const slug = ds.name.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 60) || 'dataset';
  return { fileName: `${slug}.csv`, csv: datasetCsv(ds.name, ds.unit, ds.values) };
}
