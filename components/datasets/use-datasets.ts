'use client';

import useSWR, { mutate as mutateKey } from 'swr';
import { api, fetcher } from '@/lib/client/api';
import type { DatasetCreated, DatasetDetail, DatasetRow, DatasetUseRecorded } from '@/lib/core/api-types';
import type { Law } from '@/lib/core/datasets/fit';

// One hook per resource: the firm's dataset library and one dataset with its fits. The library and detail pages
// are rendered on the server; these serve the pickers that choose a dataset inside other screens.

export const DATASETS_KEY = '/api/datasets';
export const datasetKey = (id: string) => `/api/datasets/${encodeURIComponent(id)}`;

export function useDatasets() {
  return useSWR<{ datasets: DatasetRow[] }>(DATASETS_KEY, fetcher);
}

/** One dataset with its summary and fitted laws; nothing is asked while `id` is empty. */
export function useDataset(id: string | null) {
  return useSWR<DatasetDetail>(id ? datasetKey(id) : null, fetcher);
}

/** Multipart upload (a `file`, or a pasted column as `text`, with name, unit, column and drop). */
export async function uploadDataset(form: FormData): Promise<DatasetCreated> {
  const created = await api.post<DatasetCreated>(DATASETS_KEY, form);
  void mutateKey(DATASETS_KEY);
  return created;
}

/** Deletes even when models use it (`confirm=1`): their saved versions keep the values they copied. */
export async function deleteDataset(id: string): Promise<void> {
  await api.delete(`${datasetKey(id)}?confirm=1`);
  void mutateKey(DATASETS_KEY);
}

/** Records that a model copied this dataset, and how: provenance with the dataset's hash. */
export async function recordDatasetUse(id: string, body: { modelId: string; method: 'empirical' | Law }): Promise<DatasetUseRecorded> {
  const use = await api.post<DatasetUseRecorded>(`${datasetKey(id)}/uses`, body);
  void mutateKey(DATASETS_KEY);
  void mutateKey(datasetKey(id));
  return use;
}
