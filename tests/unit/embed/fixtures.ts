import { randomUUID } from 'node:crypto';
import { getDb } from '@/db/knex';

// Direct rows for the embed tests: a firm with one member and a published widget of a two-dial model. The model is a
// valid one, as every stored version is (the embed reads it as a CheckedModel).
export const DIALED_MODEL = {
  schema: 'stochos.model/1',
  template: 'formula',
  title: 'Pump shaft clearance',
  settings: { trials: 10_000, seed: 'fixture' },
  dials: [
    { id: 'bore', label: 'Bore', unit: 'mm', min: 24.9, max: 25.1, step: 0.01, default: 25, target: { kind: 'variable' } },
    { id: 'hidden', label: 'Hidden', unit: '', min: 0, max: 1, step: 0.1, default: 0.5, target: { kind: 'variable' } },
  ],
  inputs: [{ id: 'shaft', name: 'Shaft diameter', unit: 'mm', distribution: { type: 'normal', mean: 24.95, sd: 0.01 } }],
  outputs: [{ id: 'clearance', name: 'Clearance', unit: 'mm', formula: 'bore - shaft + 0 * hidden' }],
};

export async function seedFirmWithWidget(name = 'Fixture firm'): Promise<{ firmId: string; userId: string; widgetId: string; modelId: string }> {
  const db = getDb();
  const now = new Date().toISOString();
  const firmId = randomUUID();
  const userId = randomUUID();
  const modelId = randomUUID();
  const versionId = randomUUID();
  const widgetId = randomUUID();
  await db('firms').insert({ id: firmId, name, created_at: now });
  await db('users').insert({ id: userId, email: `${userId}@fixture.example`, name: 'Fixture Author', created_at: now });
  await db('memberships').insert({ id: randomUUID(), firm_id: firmId, user_id: userId, role: 'author', created_at: now, updated_at: now });
  await db('models').insert({ id: modelId, firm_id: firmId, title: 'Shaft', template: 'formula', draft_json: '{}', created_at: now, updated_at: now });
  await db('model_versions').insert({
    id: versionId, model_id: modelId, firm_id: firmId, number: 1, model_json: JSON.stringify(DIALED_MODEL), author_id: userId, created_at: now,
    check_state: 'signed_off', checker_id: userId, checked_at: now,
  });
  await db('widgets').insert({
    id: widgetId, firm_id: firmId, model_id: modelId, version_id: versionId, title: 'Shaft clearance', panels: '["spread"]', headline: 'p-out',
    dial_ids: '["bore"]', brand_color: '#1f887b', published_by: userId, published_at: now, updated_at: now,
  });
  return { firmId, userId, widgetId, modelId };
}

/** The guard's member shape, for calling the service layer directly. */
export const memberOf = (firmId: string, userId: string) => ({
  userId, firmId, firmName: 'Fixture firm', name: 'Fixture Author', email: `${userId}@fixture.example`, role: 'author' as const, sessionVersion: 1, membershipId: 'fixture',
});
