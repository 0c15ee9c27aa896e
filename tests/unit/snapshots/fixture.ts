// A firm, client, pass and published linear-stack widget written straight into a fresh test database.
import { randomUUID } from 'node:crypto';
import { getDb } from '@/db/knex';
import { getClientById } from '@/db/clients';
import { getPassForEmbed } from '@/db/passes';
import { getPublishedWidget } from '@/db/widgets';
import { validateModel } from '@/lib/core/engine/schema';
import { exampleLinearStack } from '@/lib/core/engine/examples';
import type { Viewer } from '@/lib/server/embed/access';

export const STACK_MODEL = (() => {
  const r = validateModel(exampleLinearStack);
  if (!r.ok) throw new Error('example model does not validate');
  return r.model;
})();

export async function seedWidget(opts: { domains?: string[]; anyAddress?: boolean; paper?: 'A4' | 'Letter' } = {}): Promise<{ firmId: string; clientId: string; passId: string; widgetId: string }> {
  const db = getDb();
  const now = new Date().toISOString();
  const firmId = randomUUID();
  const modelId = randomUUID();
  const versionId = randomUUID();
  const widgetId = randomUUID();
  const clientId = randomUUID();
  const passId = randomUUID();
  await db('firms').insert({ id: firmId, name: 'Orrinvale Test Engineering', paper_size: opts.paper ?? 'A4', created_at: now });
  await db('models').insert({ id: modelId, firm_id: firmId, title: 'Shaft float', template: 'linear-stack', draft_json: JSON.stringify(STACK_MODEL), created_at: now, updated_at: now });
  await db('model_versions').insert({ id: versionId, model_id: modelId, firm_id: firmId, number: 2, model_json: JSON.stringify(STACK_MODEL), created_at: now, check_state: 'signed_off', checked_at: now });
  await db('widgets').insert({
    id: widgetId,
    firm_id: firmId,
    model_id: modelId,
    version_id: versionId,
    title: 'Pump shaft float',
    panels: '["headline","spread","cumulative","drivers"]',
    headline: 'mean',
    dial_ids: JSON.stringify(STACK_MODEL.dials.map((d) => d.id)),
    brand_color: '#1f887b',
    show_logo: 1,
    published_at: now,
    updated_at: now,
  });
  await db('clients').insert({
    id: clientId,
    firm_id: firmId,
    name: 'Harbour Pumps Ltd',
    allowed_origins: '["http://localhost:4200"]',
    allowed_email_domains: JSON.stringify(opts.domains ?? ['client.example']),
    snapshot_any_address: opts.anyAddress ?? false,
    key_version: 1,
    not_before: now,
    created_at: now,
    updated_at: now,
  });
  await db('passes').insert({ id: passId, firm_id: firmId, client_id: clientId, widget_id: widgetId, created_at: now, expires_at: new Date(Date.now() + 86_400_000).toISOString() });
  return { firmId, clientId, passId, widgetId };
}

/** The checked viewer the route handler would build from a bearer token (the token checks have their own tests). */
export async function viewerFor(s: { firmId: string; passId: string; clientId: string; widgetId: string }): Promise<Viewer> {
  const pass = (await getPassForEmbed(s.passId))!;
  const client = (await getClientById(s.clientId))!;
  const widget = (await getPublishedWidget(s.firmId, s.widgetId))!;
  return { ok: true, pass, client, widget, logoHash: null, passJti: randomUUID(), passExpiresAt: 0, session: {} as Viewer['session'] };
}
