import { describe, it, expect } from 'vitest';
import type { z } from 'zod';
import { checkSchema, createModelSchema, duplicateModelSchema, modelField, patchModelSchema, publishSchema, saveVersionSchema, widgetPatchSchema } from '@/lib/server/models/schemas';
import { exampleCostRange, exampleFormula, exampleLinearStack } from '@/lib/core/engine/examples';
import { fieldsFromZod } from '@/lib/server/http/errors';
import { blankModel } from '@/lib/server/models/blank';
import { HEADLINES, PANEL_IDS } from '@/lib/core/models/widget-options';
import { TEMPLATE_IDS } from '@/lib/core/models/templates';

// Every way the studio's request bodies are refused, with the field the message sits on.

const clone = <T>(v: T): T => JSON.parse(JSON.stringify(v));
/** A model as read from a JSON file: tests edit it freely, as a user's file could hold anything. */
type ParsedJson = ReturnType<typeof JSON.parse>;
const uuid = '0b6c5f8e-2f0a-4c7e-9a51-3d2f1e0c9b7a';

function fields(schema: z.ZodType, body: unknown): Record<string, string[]> {
  const r = schema.safeParse(body);
  expect(r.success, 'expected a refusal').toBe(false);
  return fieldsFromZod(r.error!);
}

describe('modelField (the engine schema behind every saved model)', () => {
  it('accepts each worked example and each blank model', () => {
    for (const m of [exampleLinearStack, exampleCostRange, exampleFormula]) expect(modelField.safeParse(m).success).toBe(true);
    for (const t of TEMPLATE_IDS) expect(modelField.safeParse(blankModel(t, 'Blank', { unit: 'mm', currency: 'EUR' })).success, t).toBe(true);
  });

  it('refuses a missing model', () => {
    expect(fields(modelField, undefined)).toEqual({ _: ['The model is required.'] });
    expect(fields(modelField, null)).toEqual({ _: ['The model is required.'] });
  });

  const bad: { name: string; base: unknown; edit: (m: ParsedJson) => void; path: string }[] = [
    { name: 'three-point values out of order', base: exampleCostRange, edit: (m) => (m.items[0].low = 60), path: 'items.0.low' },
    { name: 'a zero-width three-point range', base: exampleCostRange, edit: (m) => Object.assign(m.items[0], { low: 40, mostLikely: 40, high: 40 }), path: 'items.0.high' },
    { name: 'a negative tolerance', base: exampleLinearStack, edit: (m) => (m.contributors[0].plusTol = -0.01), path: 'contributors.0.plusTol' },
    { name: 'a probability above 1', base: exampleCostRange, edit: (m) => (m.riskEvents[1].probability = 1.5), path: 'riskEvents.1.probability' },
    { name: 'a probability below 0', base: exampleCostRange, edit: (m) => (m.riskEvents[1].probability = -0.1), path: 'riskEvents.1.probability' },
    { name: 'an unknown name in a formula', base: exampleFormula, edit: (m) => (m.outputs[1].formula = 'hydraulic_kw / pump_efficiency'), path: 'outputs.1.formula' },
    {
      name: 'a correlation matrix that is not positive semi-definite',
      base: exampleFormula,
      edit: (m) => (m.correlation = { inputs: ['flow', 'head', 'density'], matrix: [[1, 1, 0], [1, 1, 1], [0, 1, 1]] }),
      path: 'correlation.matrix',
    },
    { name: 'a wrong schema id', base: exampleFormula, edit: (m) => (m.schema = 'stochos.model/2'), path: 'schema' },
    { name: 'an unknown template', base: exampleFormula, edit: (m) => (m.template = 'spreadsheet'), path: 'template' },
  ];
  for (const b of bad) {
    it(`refuses ${b.name} at ${b.path}`, () => {
      const m = clone(b.base);
      b.edit(m);
      const f = fields(modelField, m);
      expect(Object.keys(f).some((k) => k === b.path || k.startsWith(`${b.path}.`)), JSON.stringify(f)).toBe(true);
    });
  }
});

describe('createModelSchema', () => {
  it('accepts a start from the example or a blank, and an import with or without a title', () => {
    expect(createModelSchema.parse({ title: ' Shaft ', template: 'linear-stack', start: 'example' })).toEqual({ title: 'Shaft', template: 'linear-stack', start: 'example', model: null });
    const imported = createModelSchema.parse({ template: 'formula', start: 'import', model: exampleFormula });
    expect(imported.title).toBe(exampleFormula.title);
    expect(imported.model?.template).toBe('formula');
    expect(createModelSchema.parse({ title: 'Mine', template: 'formula', start: 'import', model: exampleFormula }).title).toBe('Mine');
  });
  it('refuses a missing title unless importing', () => {
    expect(Object.keys(fields(createModelSchema, { template: 'formula', start: 'blank' }))).toEqual(['title']);
    expect(Object.keys(fields(createModelSchema, { title: '   ', template: 'formula', start: 'blank' }))).toEqual(['title']);
    expect(Object.keys(fields(createModelSchema, { title: 'x'.repeat(121), template: 'formula', start: 'blank' }))).toEqual(['title']);
  });
  it('refuses an unknown template or start', () => {
    expect(Object.keys(fields(createModelSchema, { title: 'T', template: 'gantt', start: 'from-thin-air' })).sort()).toEqual(['start', 'template']);
  });
  it('refuses an import without a file, a malformed file, and a file of another template', () => {
    expect(Object.keys(fields(createModelSchema, { template: 'formula', start: 'import' }))).toEqual(['model']);
    expect(Object.keys(fields(createModelSchema, { template: 'formula', start: 'import', model: { schema: 'stochos.model/1' } }))[0]).toMatch(/^model/);
    expect(fields(createModelSchema, { template: 'linear-stack', start: 'import', model: exampleFormula })['model.template']![0]).toMatch(/holds a formula model/);
    const broken = clone(exampleFormula) as ParsedJson;
    broken.inputs[0].distribution.sd = -1;
    expect(Object.keys(fields(createModelSchema, { template: 'formula', start: 'import', model: broken }))).toEqual(['model.inputs.0.distribution.sd']);
  });
});

describe('patch and duplicate', () => {
  it('needs a boolean to archive', () => {
    expect(Object.keys(fields(patchModelSchema, {}))).toEqual(['archived']);
    expect(Object.keys(fields(patchModelSchema, { archived: 'yes' }))).toEqual(['archived']);
    expect(patchModelSchema.parse({ archived: false })).toEqual({ archived: false });
  });
  it('takes an optional title for a copy', () => {
    expect(duplicateModelSchema.parse({})).toEqual({});
    expect(Object.keys(fields(duplicateModelSchema, { title: '' }))).toEqual(['title']);
  });
});

describe('saveVersionSchema', () => {
  it('accepts a model and a base version, trimming the note', () => {
    const r = saveVersionSchema.parse({ baseVersion: 0, note: '  first  ', model: exampleLinearStack });
    expect(r.note).toBe('first');
    expect(saveVersionSchema.parse({ baseVersion: null, model: exampleLinearStack }).note).toBe('');
  });
  it('refuses a missing, fractional, negative or textual base version', () => {
    for (const baseVersion of [undefined, 1.5, -1, '2']) expect(Object.keys(fields(saveVersionSchema, { baseVersion, model: exampleFormula }))).toEqual(['baseVersion']);
  });
  it('refuses a long note', () => {
    expect(Object.keys(fields(saveVersionSchema, { baseVersion: 0, note: 'n'.repeat(2001), model: exampleFormula }))).toEqual(['note']);
  });
  it('prefixes the engine’s paths with "model."', () => {
    const m = clone(exampleLinearStack) as ParsedJson;
    m.contributors[3].minusTol = -0.12;
    m.limits = {};
    const f = fields(saveVersionSchema, { baseVersion: 0, model: m });
    // Removing the limits also orphans the dial that moved the upper limit.
    expect(Object.keys(f).sort()).toEqual(['model.contributors.3.minusTol', 'model.dials.2.target', 'model.limits']);
  });
});

describe('checkSchema', () => {
  it('accepts a sign-off without a note and a send-back with a comment', () => {
    expect(checkSchema.parse({ decision: 'sign_off' })).toEqual({ decision: 'sign_off', note: '', comments: [] });
    expect(checkSchema.parse({ decision: 'send_back', comments: [{ path: 'items.0.high', text: 'Too low' }] }).comments).toHaveLength(1);
  });
  it('refuses an unknown decision', () => {
    expect(Object.keys(fields(checkSchema, { decision: 'approve' }))).toEqual(['decision']);
  });
  it('refuses a send-back that says nothing', () => {
    expect(Object.keys(fields(checkSchema, { decision: 'send_back', note: '   ' }))).toEqual(['note']);
  });
  it('refuses empty or oversized comments and notes', () => {
    expect(Object.keys(fields(checkSchema, { decision: 'send_back', comments: [{ path: 'a', text: ' ' }] }))).toEqual(['comments.0.text']);
    expect(Object.keys(fields(checkSchema, { decision: 'sign_off', comments: [{ path: 'p'.repeat(301), text: 'x' }] }))).toEqual(['comments.0.path']);
    expect(Object.keys(fields(checkSchema, { decision: 'sign_off', note: 'n'.repeat(4001) }))).toEqual(['note']);
    expect(Object.keys(fields(checkSchema, { decision: 'sign_off', comments: Array.from({ length: 201 }, () => ({ path: 'a', text: 'b' })) }))).toEqual(['comments']);
  });
});

describe('publishSchema and widgetPatchSchema', () => {
  const ok = { modelId: uuid, versionId: uuid, title: 'Widget', panels: ['headline', 'spread'], headline: 'ppm', dialIds: ['a', 'b'] };
  it('accepts a widget, defaulting the logo slot to shown', () => {
    expect(publishSchema.parse(ok)).toMatchObject({ showLogo: true });
  });
  it('refuses bad ids, no panels, unknown or repeated panels, repeated dials, a bad colour and an empty headline', () => {
    expect(Object.keys(fields(publishSchema, { ...ok, modelId: 'm1', versionId: 7 })).sort()).toEqual(['modelId', 'versionId']);
    expect(Object.keys(fields(publishSchema, { ...ok, panels: [] }))).toEqual(['panels']);
    expect(Object.keys(fields(publishSchema, { ...ok, panels: ['headline', 'pie'] }))).toEqual(['panels.1']);
    expect(Object.keys(fields(publishSchema, { ...ok, panels: ['spread', 'spread'] }))).toEqual(['panels.1']);
    expect(Object.keys(fields(publishSchema, { ...ok, dialIds: ['a', 'a'] }))).toEqual(['dialIds.1']);
    expect(Object.keys(fields(publishSchema, { ...ok, brandColor: 'red' }))).toEqual(['brandColor']);
    expect(Object.keys(fields(publishSchema, { ...ok, headline: '' }))).toEqual(['headline']);
    expect(Object.keys(fields(publishSchema, { ...ok, title: '' }))).toEqual(['title']);
  });
  it('needs at least one change in a patch', () => {
    expect(Object.keys(fields(widgetPatchSchema, {}))).toEqual(['_']);
    expect(Object.keys(fields(widgetPatchSchema, { versionId: 'v2' }))).toEqual(['versionId']);
    expect(widgetPatchSchema.parse({ showLogo: false })).toEqual({ showLogo: false });
  });
  it('offers a headline for every template and the four panels', () => {
    for (const t of TEMPLATE_IDS) expect(HEADLINES[t].length).toBeGreaterThan(0);
    expect(PANEL_IDS).toEqual(['headline', 'spread', 'cumulative', 'drivers']);
  });
});
