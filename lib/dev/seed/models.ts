import 'server-only';
import { DEMO_SPIGOT_LENGTHS } from '@/lib/dev/seed/datasets';
import type { Knex } from 'knex';
import { writeTransaction } from '@/db/knex';
import { newId } from '@/db/ids';
import { recordAudit } from '@/db/audit';
import { queueFirstFigures } from '@/lib/server/embed/first-figures';
import { SCHEMA_ID, validateModel, type StochosModel, type StochosModelInput } from '@/lib/core/engine/schema';
import { DEFAULT_PANELS } from '@/lib/core/models/widget-options';

// Two invented models of the demo firm, for its two invented clients: a pump's impeller clearance stack-up
// (Quillbrook Pumps) and a quay wall refurbishment estimate (Saltmere Harbour Trust). Each has a version signed
// off by the demo checker and published as a widget; the stack also has a later version awaiting its check.

const DAY = 86_400_000;
const settings = { design: 'monte-carlo', normalMethod: 'box-muller', correlationMethod: 'copula' } as const;

/** Front clearance between the impeller shroud and the casing wear face of an end-suction pump (mm). */
export const pumpClearanceV1 = {
  schema: SCHEMA_ID,
  template: 'linear-stack',
  title: 'QP-80 pump: impeller front clearance',
  description:
    'Axial clearance between the impeller shroud and the casing wear face when the rotor is assembled against the thrust bearing. Required 0.30 to 0.80 mm: below it the shroud rubs at start-up, above it recirculation costs efficiency.',
  unit: 'mm',
  settings: { ...settings, trials: 50_000, seed: 'qp80-clearance' },
  contributors: [
    { id: 'casing_depth', name: 'Casing depth, flange face to bearing seat', nominal: 148.0, plusTol: 0.05, minusTol: 0.05, direction: 1, distribution: { type: 'normal', k: 3 }, meanShift: 0 },
    { id: 'housing_spigot', name: 'Bearing housing spigot length', nominal: 12.0, plusTol: 0.03, minusTol: 0.03, direction: 1, distribution: { type: 'normal', k: 3 }, meanShift: 0 },
    { id: 'gasket', name: 'Flange gasket, compressed', nominal: 0.5, plusTol: 0.05, minusTol: 0.05, direction: 1, distribution: { type: 'triangular' }, meanShift: 0 },
    { id: 'bearing_width', name: 'Thrust bearing inner ring width', nominal: 21.0, plusTol: 0, minusTol: 0.12, direction: -1, distribution: { type: 'normal', k: 3 }, meanShift: 0 },
    { id: 'shaft_shoulder', name: 'Shaft, bearing shoulder to impeller seat', nominal: 96.5, plusTol: 0.04, minusTol: 0.04, direction: -1, distribution: { type: 'normal', k: 3 }, meanShift: 0 },
    { id: 'impeller_hub', name: 'Impeller hub length', nominal: 38.45, plusTol: 0.05, minusTol: 0.05, direction: -1, distribution: { type: 'triangular' }, meanShift: 0 },
    { id: 'shroud', name: 'Impeller shroud thickness (as cast)', nominal: 4.0, plusTol: 0.14, minusTol: 0.14, direction: -1, distribution: { type: 'uniform' }, meanShift: 0 },
  ],
  limits: { lower: 0.3, upper: 0.8 },
  dials: [
    { id: 'hub_length', label: 'Impeller hub length', unit: 'mm', min: 38.3, max: 38.6, step: 0.01, default: 38.45, target: { kind: 'input-param', inputId: 'impeller_hub', param: 'nominal' } },
    { id: 'casing_sigmas', label: 'Casing machining: sigmas per tolerance', unit: 'σ', min: 2, max: 4, step: 0.5, default: 3, target: { kind: 'input-param', inputId: 'casing_depth', param: 'k' } },
    { id: 'clearance_max', label: 'Largest clearance accepted', unit: 'mm', min: 0.7, max: 1.0, step: 0.05, default: 0.8, target: { kind: 'limit', which: 'upper' } },
  ],
} satisfies StochosModelInput;

/** Version 2: the shroud face machined after casting, so its band narrows and its spread is no longer flat. */
export const pumpClearanceV2 = {
  ...pumpClearanceV1,
  contributors: pumpClearanceV1.contributors.map((c) =>
    c.id === 'shroud'
      ? { ...c, name: 'Impeller shroud thickness (faced after casting)', plusTol: 0.08, minusTol: 0.08, distribution: { type: 'normal' as const, k: 3 } }
      : c.id === 'housing_spigot'
        ? // Normal law fitted to the 60 measured parts of the seeded dataset, not the ±3σ assumption.
          { ...c, name: 'Bearing housing spigot length (measured, batch 14)', distribution: { type: 'normal-fit' as const, data: DEMO_SPIGOT_LENGTHS } }
        : c,
  ),
} satisfies StochosModelInput;

/** Stage 1 refurbishment of a harbour quay wall (thousand EUR). */
export const quayWallV1 = {
  schema: SCHEMA_ID,
  template: 'cost-range',
  title: 'North Quay wall refurbishment, stage 1',
  description:
    'Anchored sheet-pile quay wall, 160 m: capping beam renewal, anchorage and concrete repairs, toe dredging and cathodic protection, built from the water in tidal windows. Figures in thousand EUR, at this year’s prices.',
  currency: 'kEUR',
  settings: { ...settings, trials: 20_000, seed: 'north-quay-stage-1' },
  items: [
    { id: 'mobilisation', name: 'Mobilisation and site establishment', low: 85, mostLikely: 95, high: 120, distribution: 'pert' },
    { id: 'cofferdam', name: 'Temporary works and cofferdam', low: 180, mostLikely: 210, high: 290, distribution: 'pert' },
    { id: 'beam_demolition', name: 'Break out of the old capping beam', low: 60, mostLikely: 70, high: 95, distribution: 'pert' },
    { id: 'anchorage', name: 'Anchor tie and waling repairs', low: 140, mostLikely: 175, high: 260, distribution: 'pert' },
    { id: 'concrete_repair', name: 'Sprayed concrete repairs', low: 120, mostLikely: 150, high: 230, distribution: 'pert' },
    { id: 'capping_beam', name: 'New capping beam, bollards and fenders', low: 210, mostLikely: 240, high: 300, distribution: 'pert' },
    { id: 'dredging', name: 'Dredging at the wall toe', low: 70, mostLikely: 90, high: 150, distribution: 'triangular' },
    { id: 'cathodic', name: 'Cathodic protection system', low: 95, mostLikely: 110, high: 140, distribution: 'pert' },
    { id: 'design', name: 'Design, supervision and monitoring', low: 110, mostLikely: 120, high: 140, distribution: 'uniform' },
    { id: 'marine_plant', name: 'Marine plant: jack-up barge and crane', low: 130, mostLikely: 150, high: 210, distribution: 'pert' },
  ],
  correlationGroups: [
    { id: 'marine_works', name: 'Marine works share plant, weather and tides', items: ['cofferdam', 'anchorage', 'dredging', 'marine_plant'], rho: 0.5 },
    { id: 'concrete_works', name: 'Concrete works share a subcontractor', items: ['beam_demolition', 'concrete_repair', 'capping_beam'], rho: 0.35 },
  ],
  riskEvents: [
    { id: 'ordnance', name: 'Ordnance found in the toe dredging survey', probability: 0.1, impact: { low: 40, mostLikely: 60, high: 150, distribution: 'pert' } },
    { id: 'tidal_windows', name: 'Tidal working windows shorter than planned', probability: 0.35, impact: { low: 30, mostLikely: 50, high: 90, distribution: 'triangular' } },
    { id: 'tie_corrosion', name: 'Anchor ties more corroded than the samples', probability: 0.25, impact: { low: 80, mostLikely: 120, high: 220, distribution: 'pert' } },
    { id: 'nesting_season', name: 'Nesting season stops piling for six weeks', probability: 0.15, impact: { low: 20, mostLikely: 35, high: 70, distribution: 'pert' } },
  ],
  baseEstimate: 1410,
  budget: 1650,
  confidence: 0.8,
  dials: [
    { id: 'budget_dial', label: 'Budget', unit: 'kEUR', min: 1450, max: 1950, step: 10, default: 1650, target: { kind: 'budget' } },
    { id: 'confidence_dial', label: 'Confidence for the contingency', unit: '', min: 0.5, max: 0.95, step: 0.05, default: 0.8, target: { kind: 'confidence' } },
    { id: 'tie_corrosion_p', label: 'Chance the anchor ties are worse than sampled', unit: '', min: 0, max: 1, step: 0.05, default: 0.25, target: { kind: 'input-param', inputId: 'tie_corrosion', param: 'probability' } },
    { id: 'marine_rho', label: 'Correlation of the marine works', unit: '', min: 0, max: 0.8, step: 0.1, default: 0.5, target: { kind: 'group-correlation', groupId: 'marine_works' } },
  ],
} satisfies StochosModelInput;

function valid(input: StochosModelInput): StochosModel {
  const r = validateModel(input);
  if (!r.ok) throw new Error(`Demo model "${input.title}" does not validate: ${r.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; ')}`);
  return r.model;
}

async function memberId(trx: Knex.Transaction, firmId: string, role: 'author' | 'checker', preferEmail: string): Promise<string> {
  const rows = await trx('memberships as m')
    .join('users as u', 'u.id', 'm.user_id')
    .where({ 'm.firm_id': firmId, 'm.role': role, 'm.status': 'active' })
    .select('u.id', 'u.email')
    .orderBy('u.email');
  const row = rows.find((r) => r.email === preferEmail) ?? rows[0];
  if (!row) throw new Error(`The demo firm has no active ${role}.`);
  return row.id as string;
}

interface SeedVersion {
  model: StochosModel;
  authorId: string;
  at: number;
  note: string;
  check?: { checkerId: string; at: number; note: string };
}

async function seedModel(
  trx: Knex.Transaction,
  firmId: string,
  m: { title: string; template: StochosModel['template']; createdBy: string; createdAt: number; versions: SeedVersion[]; publish: { version: number; headline: string; by: string; at: number; brandColor: string } },
): Promise<{ modelId: string; widgetId: string }> {
  const modelId = newId();
  const iso = (t: number) => new Date(t).toISOString();
  const last = m.versions[m.versions.length - 1]!;
  await trx('models').insert({
    id: modelId,
    firm_id: firmId,
    title: m.title,
    template: m.template,
    draft_json: JSON.stringify(m.versions[0]!.model),
    created_by: m.createdBy,
    created_at: iso(m.createdAt),
    updated_by: last.authorId,
    updated_at: iso(last.at),
  });
  await recordAudit({ firmId, actorUserId: m.createdBy, action: 'model.created', targetType: 'model', targetId: modelId, detail: { title: m.title, template: m.template, seeded: true } }, trx);
  const versionIds: string[] = [];
  for (const [i, v] of m.versions.entries()) {
    const id = newId();
    versionIds.push(id);
    await trx('model_versions').insert({
      id,
      model_id: modelId,
      firm_id: firmId,
      number: i + 1,
      model_json: JSON.stringify(v.model),
      author_id: v.authorId,
      created_at: iso(v.at),
      note: v.note,
      ...(v.check ? { check_state: 'signed_off', checker_id: v.check.checkerId, checked_at: iso(v.check.at), check_note: v.check.note } : {}),
    });
    await recordAudit({ firmId, actorUserId: v.authorId, action: 'version.saved', targetType: 'version', targetId: id, detail: { modelId, number: i + 1, note: v.note, seeded: true } }, trx);
    if (v.check) {
      await recordAudit({ firmId, actorUserId: v.check.checkerId, action: 'version.signed_off', targetType: 'version', targetId: id, detail: { modelId, number: i + 1, note: v.check.note, seeded: true } }, trx);
    }
  }
  const published = m.versions[m.publish.version - 1]!;
  const widgetId = newId();
  await trx('widgets').insert({
    id: widgetId,
    firm_id: firmId,
    model_id: modelId,
    version_id: versionIds[m.publish.version - 1],
    title: published.model.title,
    panels: JSON.stringify(DEFAULT_PANELS),
    headline: m.publish.headline,
    dial_ids: JSON.stringify(published.model.dials.map((d) => d.id)),
    brand_color: m.publish.brandColor,
    show_logo: true,
    published_by: m.publish.by,
    published_at: iso(m.publish.at),
    updated_by: m.publish.by,
    updated_at: iso(m.publish.at),
  });
  await recordAudit(
    { firmId, actorUserId: m.publish.by, action: 'widget.published', targetType: 'widget', targetId: widgetId, detail: { modelId, number: m.publish.version, checkState: 'signed_off', seeded: true } },
    trx,
  );
  // As publishing does: the server computes the widget's first figures, so the demo's first visit shows them at once.
  await queueFirstFigures(firmId, versionIds[m.publish.version - 1]!, trx);
  return { modelId, widgetId };
}

/** Adds the two demo models to a freshly seeded demo firm (run before the clients' seed, which grants passes to every widget). */
export async function seedModels(firmId: string): Promise<{ models: number; widgets: number }> {
  const pumpV1 = valid(pumpClearanceV1);
  const pumpV2 = valid(pumpClearanceV2);
  const quay = valid(quayWallV1);
  return writeTransaction(async (trx) => {
    const existing = await trx('models').where({ firm_id: firmId }).whereIn('title', [pumpV1.title, quay.title]).select('id');
    if (existing.length) return { models: 0, widgets: 0 };
    const firm = await trx('firms').where({ id: firmId }).select('brand_color').first();
    const brandColor = (firm?.brand_color as string | undefined) ?? '#1f887b';
    const author = await memberId(trx, firmId, 'author', 'author@orrinvale.example');
    const author2 = await memberId(trx, firmId, 'author', 'author2@orrinvale.example');
    const checker = await memberId(trx, firmId, 'checker', 'checker@orrinvale.example');
    const t0 = Date.now() - 12 * DAY;

    await seedModel(trx, firmId, {
      title: pumpV1.title,
      template: 'linear-stack',
      createdBy: author,
      createdAt: t0,
      versions: [
        {
          model: pumpV1,
          authorId: author,
          at: t0 + 2 * 3_600_000,
          note: 'Stack from Quillbrook drawings QP80-100 rev D and QP80-214 rev B; shroud taken as cast.',
          check: { checkerId: checker, at: t0 + DAY, note: 'Loop and directions checked against the assembly section; tolerances match the drawings.' },
        },
        { model: pumpV2, authorId: author2, at: t0 + 9 * DAY, note: 'Shroud face machined after casting (Quillbrook proposal 14), so ±0.08 mm, normal; spigot length fitted to the 60 measured parts of batch 14 (dataset library).' },
      ],
      publish: { version: 1, headline: 'ppm', by: author, at: t0 + DAY + 3_600_000, brandColor },
    });
    await seedModel(trx, firmId, {
      title: quay.title,
      template: 'cost-range',
      createdBy: author2,
      createdAt: t0 + 2 * DAY,
      versions: [
        {
          model: quay,
          authorId: author2,
          at: t0 + 3 * DAY,
          note: 'Stage 1 estimate after the diver survey; risk register from the workshop with the Trust.',
          check: { checkerId: checker, at: t0 + 4 * DAY, note: 'Quantities traced to the survey; ranges and correlation groups are reasonable for this stage.' },
        },
      ],
      publish: { version: 1, headline: 'at-confidence', by: author2, at: t0 + 5 * DAY, brandColor },
    });
    return { models: 2, widgets: 2 };
  });
}
