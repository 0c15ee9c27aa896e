'use client';

import useSWR, { mutate as mutateKey } from 'swr';
import { api, fetcher } from '@/lib/client/api';
import type { CheckedModel } from '@/lib/core/engine/checked-model';
import type { CheckComment, ModelListRow, ModelRecord, TemplateId, VersionRecord, VersionSummary, WidgetRecord } from '@/lib/core/models/types';
import type { ModelDetail } from '@/lib/core/api-types';

// One hook per resource of the studio; actions revalidate what they change.

export const modelsKey = (includeArchived: boolean) => `/api/models${includeArchived ? '?archived=1' : ''}`;
export const modelKey = (id: string) => `/api/models/${encodeURIComponent(id)}`;
export const versionKey = (id: string, n: number) => `/api/models/${encodeURIComponent(id)}/versions/${n}`;

export type { ModelDetail } from '@/lib/core/api-types';

export interface CreateModelBody {
  title?: string;
  template: TemplateId;
  start: 'example' | 'blank' | 'import';
  model?: unknown;
}

export function useModels(includeArchived: boolean) {
  const swr = useSWR<{ models: ModelListRow[] }>(modelsKey(includeArchived), fetcher);
  const { mutate } = swr;
  return {
    ...swr,
    create: async (body: CreateModelBody) => {
      const res = await api.post<{ model: ModelRecord }>('/api/models', body);
      await mutate();
      return res.model;
    },
    duplicate: async (id: string) => {
      const res = await api.post<{ model: ModelRecord }>(`${modelKey(id)}/duplicate`, {});
      await mutate();
      return res.model;
    },
    setArchived: async (id: string, archived: boolean) => {
      await api.patch(modelKey(id), { archived });
      await mutate();
    },
  };
}

/** One model with its versions and live widget; nothing is asked while `id` is null (no model chosen yet). */
export function useModel(id: string | null) {
  const swr = useSWR<ModelDetail>(id ? modelKey(id) : null, fetcher);
  const { mutate } = swr;
  const key = () => {
    if (!id) throw new Error('Choose a model first.');
    return modelKey(id);
  };
  return {
    ...swr,
    rename: async (title: string) => {
      await api.patch(key(), { title });
      await mutate();
    },
    saveVersion: async (body: { baseVersion: number | null; note: string; model: CheckedModel }) => {
      const res = await api.post<{ version: VersionRecord }>(`${key()}/versions`, body);
      await mutate();
      return res.version;
    },
  };
}

export function useVersion(modelId: string, n: number | null) {
  return useSWR<{ version: VersionRecord }>(n && n > 0 ? versionKey(modelId, n) : null, fetcher);
}

export async function checkVersion(versionId: string, body: { decision: 'sign_off' | 'send_back'; note: string; comments: CheckComment[] }) {
  const v = (await api.post<{ version: VersionSummary }>(`/api/versions/${encodeURIComponent(versionId)}/check`, body)).version;
  // The header's count of versions to check drops at once.
  void mutateKey('/api/reviews/waiting');
  return v;
}

export interface WidgetBody {
  title: string;
  panels: string[];
  headline: string;
  dialIds: string[];
  brandColor: string;
  showLogo: boolean;
}

export async function publishWidget(body: WidgetBody & { modelId: string; versionId: string }) {
  return (await api.post<{ widget: WidgetRecord }>('/api/widgets', body)).widget;
}

export async function updateWidget(id: string, body: Partial<WidgetBody> & { versionId?: string }) {
  return (await api.patch<{ widget: WidgetRecord }>(`/api/widgets/${encodeURIComponent(id)}`, body)).widget;
}

export async function unpublishWidget(id: string) {
  await api.delete(`/api/widgets/${encodeURIComponent(id)}`);
}
