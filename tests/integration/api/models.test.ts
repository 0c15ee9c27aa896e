import { describe, it, expect, inject, beforeAll, afterAll } from 'vitest';
import type Database from 'better-sqlite3';
import { newFirm, addMember } from '../../support/firms';
import { openTestDb } from '../../support/db-direct';
import type { Client } from '../../support/http-client';
import { exampleCostRange, exampleFormula, exampleLinearStack } from '@/lib/core/engine/examples';

// The studio's API end to end: versions, optimistic saves, checking, publishing, firm scoping and bad input.
const appUrl = inject('appUrl');
const mailboxUrl = inject('mailboxUrl');

type Fields = Record<string, string[]>;
interface ErrBody {
  error: { code: string; message: string; fields?: Fields };
}
interface VersionBody {
  id: string;
  number: number;
  checkState: string;
  authorName: string;
  model: Record<string, unknown>;
}

const clone = <T>(v: T): T => JSON.parse(JSON.stringify(v));
/** A model as read from a JSON file: tests edit it freely, as a user's file could hold anything. */
type ParsedJson = ReturnType<typeof JSON.parse>;

let owner: Client;
let author: Client;
let author2: Client;
let checker: Client;
let converted: { client: Client; membershipId: string; owner: Client };
let outsiderAuthor: Client;
let db: Database.Database;

beforeAll(async () => {
  const firm = await newFirm(appUrl, 'studio');
  owner = firm.owner;
  author = (await addMember(appUrl, mailboxUrl, owner, 'author')).client;
  author2 = (await addMember(appUrl, mailboxUrl, owner, 'author')).client;
  checker = (await addMember(appUrl, mailboxUrl, owner, 'checker')).client;
  // A trial firm has three seats, so the member whose role changes sits in a firm of its own.
  const third = await newFirm(appUrl, 'studio-converted');
  converted = { ...(await addMember(appUrl, mailboxUrl, third.owner, 'author')), owner: third.owner };
  const other = await newFirm(appUrl, 'studio-other');
  outsiderAuthor = (await addMember(appUrl, mailboxUrl, other.owner, 'author')).client;
  db = openTestDb(inject('dataDir'));
});
afterAll(() => db?.close());

async function create(c: Client, template: 'linear-stack' | 'cost-range' | 'formula', start: 'example' | 'blank' = 'example', title = `Studio ${template}`) {
  const res = await c.json<{ model: { id: string; title: string; draft: Record<string, unknown> } }>('POST', '/api/models', { title, template, start });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.model;
}

async function save(c: Client, modelId: string, baseVersion: number, model: unknown, note = '') {
  return c.json<{ version: VersionBody } & ErrBody>('POST', `/api/models/${modelId}/versions`, { baseVersion, note, model });
}

/** The first-figures rows of a version (queued on sign-off, publish and a change of version; computed by the worker). */
const firstFigures = (versionId: string) => db.prepare('select state from first_figures where version_id = ?').all(versionId) as { state: string }[];
const versionCount = (modelId: string) => (db.prepare('select count(*) n from model_versions where model_id = ?').get(modelId) as { n: number }).n;

describe('creating models', () => {
  it('starts from the engine’s worked example with the chosen title, or from a valid blank', async () => {
    const m = await create(author, 'linear-stack', 'example', 'Pump shaft float');
    expect(m.draft.title).toBe('Pump shaft float');
    expect((m.draft.contributors as unknown[]).length).toBe(exampleLinearStack.contributors.length);
    const blank = await create(author, 'cost-range', 'blank', 'Blank cost');
    expect((blank.draft.items as unknown[]).length).toBe(1);
    const list = await author.json<{ models: { id: string; latestVersion: unknown; published: unknown }[] }>('GET', '/api/models');
    expect(list.body.models.find((x) => x.id === m.id)).toMatchObject({ latestVersion: null, published: null });
  });

  it('imports a model file, refusing one of another template or schema with the field at fault', async () => {
    const ok = await author.json<{ model: { title: string } }>('POST', '/api/models', { template: 'formula', start: 'import', model: exampleFormula });
    expect(ok.status).toBe(201);
    expect(ok.body.model.title).toBe(exampleFormula.title);
    const wrongTemplate = await author.json<ErrBody>('POST', '/api/models', { template: 'cost-range', start: 'import', model: exampleFormula });
    expect(wrongTemplate.status).toBe(422);
    expect(Object.keys(wrongTemplate.body.error.fields!)).toEqual(['model.template']);
    const wrongSchema = await author.json<ErrBody>('POST', '/api/models', { template: 'formula', start: 'import', model: { ...exampleFormula, schema: 'stochos.model/0' } });
    expect(wrongSchema.status).toBe(422);
    expect(Object.keys(wrongSchema.body.error.fields!)).toEqual(['model.schema']);
    const before = (db.prepare('select count(*) n from models').get() as { n: number }).n;
    const malformed = await author.request('POST', '/api/models', '{"template":"formula","start":"import","model":{"schema":', { 'content-type': 'application/json' });
    expect(malformed.status).toBe(400);
    expect((db.prepare('select count(*) n from models').get() as { n: number }).n).toBe(before);
  });

  it('names every bad field of the request itself', async () => {
    const res = await author.json<ErrBody>('POST', '/api/models', { title: '', template: 'spreadsheet', start: 'later' });
    expect(res.status).toBe(422);
    expect(Object.keys(res.body.error.fields!).sort()).toEqual(['start', 'template', 'title']);
  });
});

describe('saving versions', () => {
  it('numbers versions from 1, keeps each one unchanged, and updates the list', async () => {
    const m = await create(author, 'linear-stack');
    const v1 = await save(author, m.id, 0, m.draft, 'first cut');
    expect(v1.status).toBe(201);
    expect(v1.body.version).toMatchObject({ number: 1, checkState: 'unchecked', authorName: 'Test author' });
    const changed = clone(m.draft) as { contributors: { plusTol: number }[]; title: string };
    changed.contributors[0]!.plusTol = 0.08;
    changed.title = 'Renamed in v2';
    const v2 = await save(author, m.id, 1, changed);
    expect(v2.body.version.number).toBe(2);
    const again = await author.json<{ version: VersionBody }>('GET', `/api/models/${m.id}/versions/1`);
    expect((again.body.version.model.contributors as { plusTol: number }[])[0]!.plusTol).toBe(0.05);
    const list = await author.json<{ models: { id: string; title: string; latestVersion: { number: number } }[] }>('GET', '/api/models');
    expect(list.body.models.find((x) => x.id === m.id)).toMatchObject({ title: 'Renamed in v2', latestVersion: { number: 2 } });
  });

  it('tells the later of two editors that a newer version exists, and writes nothing', async () => {
    const m = await create(author, 'cost-range');
    await save(author, m.id, 0, m.draft);
    // Both start from version 1; author2 saves first.
    expect((await save(author2, m.id, 1, m.draft, 'author2 edit')).status).toBe(201);
    const late = await save(author, m.id, 1, m.draft, 'my edit');
    expect(late.status).toBe(409);
    expect(late.body.error.message).toMatch(/^Version 2 was saved by Test author at \d{4}-\d{2}-\d{2} \d{2}:\d{2} UTC; reload to see it/);
    expect(versionCount(m.id)).toBe(2);
    // A base from the future is refused too.
    expect((await save(author, m.id, 7, m.draft)).status).toBe(409);
  });

  it('refuses a change of template', async () => {
    const m = await create(author, 'formula');
    const res = await save(author, m.id, 0, exampleCostRange);
    expect(res.status).toBe(422);
    expect(Object.keys(res.body.error.fields!)).toEqual(['model.template']);
    expect(versionCount(m.id)).toBe(0);
  });

  // Each bad input: the message sits on the field at fault, and no version is written.
  const cases: { name: string; template: 'linear-stack' | 'cost-range' | 'formula'; edit: (m: ParsedJson) => void; field: string; message: RegExp }[] = [
    { name: 'three-point values out of order', template: 'cost-range', edit: (m) => (m.items[1].low = 200), field: 'model.items.1.low', message: /above the high/ },
    { name: 'a most likely value outside its range', template: 'cost-range', edit: (m) => (m.items[0].mostLikely = 10), field: 'model.items.0.mostLikely', message: /between/ },
    { name: 'a zero-width range', template: 'formula', edit: (m) => (m.inputs[3].distribution = { type: 'uniform', min: 998, max: 998 }), field: 'model.inputs.3.distribution.max', message: /zero width/ },
    { name: 'a tolerance below zero', template: 'linear-stack', edit: (m) => (m.contributors[2].minusTol = -0.03), field: 'model.contributors.2.minusTol', message: /0 or more/ },
    { name: 'a probability outside [0, 1]', template: 'cost-range', edit: (m) => (m.riskEvents[0].probability = 1.3), field: 'model.riskEvents.0.probability', message: /between 0 and 1/ },
    { name: 'an unknown name in a formula', template: 'formula', edit: (m) => (m.outputs[0].formula = 'density * g * flow * head'), field: 'model.outputs.0.formula', message: /g/ },
    {
      name: 'a correlation matrix that is not positive semi-definite',
      template: 'formula',
      edit: (m) => {
        m.correlation = { inputs: ['flow', 'head', 'pump_eff'], matrix: [[1, 0.9, -0.9], [0.9, 1, 0.9], [-0.9, 0.9, 1]] };
      },
      field: 'model.correlation.matrix',
      message: /eigenvalue/,
    },
    { name: 'too few trials', template: 'linear-stack', edit: (m) => (m.settings.trials = 10), field: 'model.settings.trials', message: /1,000/ },
  ];
  for (const c of cases) {
    it(`refuses ${c.name} on ${c.field}`, async () => {
      const m = await create(author, c.template);
      const bad = clone(m.draft);
      c.edit(bad);
      const res = await save(author, m.id, 0, bad);
      expect(res.status).toBe(422);
      const fields = res.body.error.fields!;
      const key = Object.keys(fields).find((k) => k === c.field || k.startsWith(`${c.field}.`));
      expect(key, JSON.stringify(fields)).toBeDefined();
      expect(fields[key!]!.join(' ')).toMatch(c.message);
      expect(versionCount(m.id)).toBe(0);
    });
  }

  it('refuses a body without a model or a base version', async () => {
    const m = await create(author, 'formula');
    const res = await author.json<ErrBody>('POST', `/api/models/${m.id}/versions`, { note: 'x' });
    expect(res.status).toBe(422);
    expect(Object.keys(res.body.error.fields!).sort()).toEqual(['baseVersion', 'model']);
  });
});

describe('checking', () => {
  it('lets a checker sign off another member’s version once, with the note on record', async () => {
    const m = await create(author, 'linear-stack');
    const v = (await save(author, m.id, 0, m.draft)).body.version;
    const res = await checker.json<{ version: { checkState: string; checkerName: string; checkNote: string } }>('POST', `/api/versions/${v.id}/check`, { decision: 'sign_off', note: 'Stack checked against drawing rev C.' });
    expect(res.status).toBe(200);
    expect(res.body.version).toMatchObject({ checkState: 'signed_off', checkerName: 'Test checker', checkNote: 'Stack checked against drawing rev C.' });
    const again = await checker.json<ErrBody>('POST', `/api/versions/${v.id}/check`, { decision: 'send_back', note: 'second thoughts' });
    expect(again.status).toBe(409);
    expect(again.body.error.message).toMatch(/already signed off by Test checker/);
  });

  it('sends a version back only with a note or a comment', async () => {
    const m = await create(author, 'cost-range');
    const v = (await save(author, m.id, 0, m.draft)).body.version;
    const bare = await checker.json<ErrBody>('POST', `/api/versions/${v.id}/check`, { decision: 'send_back' });
    expect(bare.status).toBe(422);
    expect(Object.keys(bare.body.error.fields!)).toEqual(['note']);
    const res = await checker.json<{ version: { checkState: string; comments: unknown[] } }>('POST', `/api/versions/${v.id}/check`, {
      decision: 'send_back',
      comments: [{ path: 'items.4.high', text: 'The high estimate for steel repairs looks light.' }],
    });
    expect(res.body.version).toMatchObject({ checkState: 'sent_back', comments: [{ path: 'items.4.high', text: 'The high estimate for steel repairs looks light.' }] });
  });

  it('never lets the author of a version sign it off, even after becoming a checker', async () => {
    const m = await create(converted.client, 'formula');
    const v = (await save(converted.client, m.id, 0, m.draft)).body.version;
    expect((await converted.client.json('POST', `/api/versions/${v.id}/check`, { decision: 'sign_off', note: 'mine' })).status).toBe(403);
    const role = await converted.owner.json('PATCH', `/api/team/members/${converted.membershipId}`, { role: 'checker' });
    expect(role.status).toBe(200);
    const own = await converted.client.json<ErrBody>('POST', `/api/versions/${v.id}/check`, { decision: 'sign_off', note: 'mine' });
    expect(own.status).toBe(403);
    expect(own.body.error.message).toMatch(/You wrote version 1, so you cannot check it/);
    expect((db.prepare('select check_state from model_versions where id = ?').get(v.id) as { check_state: string }).check_state).toBe('unchecked');
  });
});

describe('publishing', () => {
  const widgetBody = (modelId: string, versionId: string) => ({ modelId, versionId, title: 'Shaft float for the client', panels: ['headline', 'spread', 'cumulative'], headline: 'ppm', dialIds: ['spacer_length'] });

  it('publishes only a checked version while the firm requires checks, and republishes only on request', async () => {
    const m = await create(author, 'linear-stack');
    const v1 = (await save(author, m.id, 0, m.draft)).body.version;
    const early = await author.json<ErrBody>('POST', '/api/widgets', widgetBody(m.id, v1.id));
    expect(early.status).toBe(409);
    expect(early.body.error.message).toMatch(/has not been signed off/);
    expect(firstFigures(v1.id)).toEqual([]);

    await checker.json('POST', `/api/versions/${v1.id}/check`, { decision: 'sign_off', note: 'ok' });
    // Signed off: its first figures are queued at once (and computed by the worker process soon after).
    expect(firstFigures(v1.id)).toHaveLength(1);
    const pub = await author.json<{ widget: { id: string; versionNumber: number; brandColor: string } }>('POST', '/api/widgets', widgetBody(m.id, v1.id));
    expect(pub.status).toBe(201);
    // Publishing the same version queues nothing more.
    expect(firstFigures(v1.id)).toHaveLength(1);
    await expect.poll(() => firstFigures(v1.id)[0]?.state, { timeout: 30_000 }).toBe('done');
    expect(pub.body.widget.versionNumber).toBe(1);
    expect(pub.body.widget.brandColor).toMatch(/^#[0-9a-f]{6}$/i);
    expect((await author.json('POST', '/api/widgets', widgetBody(m.id, v1.id))).status).toBe(409);

    // A later version does not reach the widget by itself, and an unchecked one cannot be moved onto it.
    const v2 = (await save(author, m.id, 1, m.draft, 'v2')).body.version;
    expect((await author.json<{ widget: { versionNumber: number } }>('GET', `/api/widgets/${pub.body.widget.id}`)).body.widget.versionNumber).toBe(1);
    expect((await author.json('PATCH', `/api/widgets/${pub.body.widget.id}`, { versionId: v2.id })).status).toBe(409);

    // The owner relaxes the rule: now an unchecked version may be published, but never a sent-back one.
    expect((await owner.json('PATCH', '/api/settings', { requireCheck: false })).status).toBe(200);
    try {
      const moved = await author.json<{ widget: { versionNumber: number; versionCheckState: string } }>('PATCH', `/api/widgets/${pub.body.widget.id}`, { versionId: v2.id });
      expect(moved.status).toBe(200);
      expect(moved.body.widget).toMatchObject({ versionNumber: 2, versionCheckState: 'unchecked' });
      // An unchecked version moved onto the widget gets its first figures too.
      expect(firstFigures(v2.id)).toHaveLength(1);
      const v3 = (await save(author, m.id, 2, m.draft, 'v3')).body.version;
      await checker.json('POST', `/api/versions/${v3.id}/check`, { decision: 'send_back', note: 'no' });
      const sentBack = await author.json<ErrBody>('PATCH', `/api/widgets/${pub.body.widget.id}`, { versionId: v3.id });
      expect(sentBack.status).toBe(409);
      expect(sentBack.body.error.message).toMatch(/sent back/);
      expect(firstFigures(v3.id)).toEqual([]);
    } finally {
      await owner.json('PATCH', '/api/settings', { requireCheck: true });
    }
    const audit = await owner.json<{ entries: { action: string }[] }>('GET', '/api/audit');
    const actions = audit.body.entries.map((e) => e.action);
    for (const a of ['model.created', 'version.saved', 'version.signed_off', 'version.sent_back', 'widget.published', 'widget.republished']) expect(actions).toContain(a);
  });

  it('checks the headline and dials against the version', async () => {
    const m = await create(author, 'linear-stack');
    const v = (await save(author, m.id, 0, m.draft)).body.version;
    await checker.json('POST', `/api/versions/${v.id}/check`, { decision: 'sign_off', note: 'ok' });
    const res = await author.json<ErrBody>('POST', '/api/widgets', { ...widgetBody(m.id, v.id), headline: 'p80', dialIds: ['spacer_length', 'no_such_dial', 'spacer_length'] });
    expect(res.status).toBe(422);
    expect(Object.keys(res.body.error.fields!).sort()).toEqual(['dialIds.2']);
    const res2 = await author.json<ErrBody>('POST', '/api/widgets', { ...widgetBody(m.id, v.id), headline: 'p80', dialIds: ['no_such_dial'] });
    expect(Object.keys(res2.body.error.fields!).sort()).toEqual(['dialIds.0', 'headline']);
    const res3 = await author.json<ErrBody>('POST', '/api/widgets', { ...widgetBody(m.id, v.id), panels: [], brandColor: 'teal' });
    expect(Object.keys(res3.body.error.fields!).sort()).toEqual(['brandColor', 'panels']);
  });

  it('keeps an archived model’s widget from vanishing without a decision', async () => {
    const m = await create(author, 'cost-range');
    const v = (await save(author, m.id, 0, m.draft)).body.version;
    await checker.json('POST', `/api/versions/${v.id}/check`, { decision: 'sign_off', note: 'ok' });
    const w = (await owner.json<{ widget: { id: string } }>('POST', '/api/widgets', { modelId: m.id, versionId: v.id, title: 'Bridge costs', panels: ['headline'], headline: 'at-confidence', dialIds: [] })).body.widget;
    expect((await author.json<ErrBody>('PATCH', `/api/models/${m.id}`, { archived: true })).status).toBe(409);
    expect((await author.request('DELETE', `/api/widgets/${w.id}`)).status).toBe(204);
    expect((await author.json('PATCH', `/api/models/${m.id}`, { archived: true })).status).toBe(200);
    const archivedSave = await save(author, m.id, 1, m.draft);
    expect(archivedSave.status).toBe(409);
    expect(archivedSave.body.error.message).toMatch(/archived/);
    const list = await author.json<{ models: { id: string }[] }>('GET', '/api/models');
    expect(list.body.models.map((x) => x.id)).not.toContain(m.id);
    const all = await author.json<{ models: { id: string; archivedAt: string | null }[] }>('GET', '/api/models?archived=1');
    expect(all.body.models.find((x) => x.id === m.id)?.archivedAt).toBeTruthy();
  });
});

describe('duplicating', () => {
  it('copies the latest version into a new model with no versions', async () => {
    const m = await create(author, 'linear-stack');
    const edited = clone(m.draft) as { contributors: { nominal: number }[] };
    edited.contributors[0]!.nominal = 62.5;
    await save(author, m.id, 0, edited);
    const dup = await author.json<{ model: { id: string; title: string; draft: { contributors: { nominal: number }[]; title: string } } }>('POST', `/api/models/${m.id}/duplicate`, {});
    expect(dup.status).toBe(201);
    expect(dup.body.model.title).toBe(`${m.title} (copy)`);
    expect(dup.body.model.draft.title).toBe(`${m.title} (copy)`);
    expect(dup.body.model.draft.contributors[0]!.nominal).toBe(62.5);
    expect(versionCount(dup.body.model.id)).toBe(0);
  });
});

describe('firm scoping', () => {
  it('shows another firm’s model, version and widget to nobody outside it', async () => {
    const m = await create(author, 'formula');
    const v = (await save(author, m.id, 0, m.draft)).body.version;
    await checker.json('POST', `/api/versions/${v.id}/check`, { decision: 'sign_off', note: 'ok' });
    const w = (await author.json<{ widget: { id: string } }>('POST', '/api/widgets', { modelId: m.id, versionId: v.id, title: 'Pump load', panels: ['headline'], headline: 'mean', dialIds: [] })).body.widget;
    expect((await outsiderAuthor.get(`/api/models/${m.id}`)).status).toBe(404);
    expect((await outsiderAuthor.get(`/api/models/${m.id}/versions`)).status).toBe(404);
    expect((await outsiderAuthor.get(`/api/models/${m.id}/versions/1`)).status).toBe(404);
    expect((await outsiderAuthor.json('POST', `/api/models/${m.id}/versions`, { baseVersion: 1, model: m.draft })).status).toBe(404);
    expect((await outsiderAuthor.json('POST', `/api/models/${m.id}/duplicate`, {})).status).toBe(404);
    expect((await outsiderAuthor.json('PATCH', `/api/models/${m.id}`, { archived: true })).status).toBe(404);
    expect((await outsiderAuthor.get(`/api/widgets/${w.id}`)).status).toBe(404);
    expect((await outsiderAuthor.json('PATCH', `/api/widgets/${w.id}`, { title: 'stolen' })).status).toBe(404);
    const list = await outsiderAuthor.json<{ models: { id: string }[] }>('GET', '/api/models');
    expect(list.body.models.map((x) => x.id)).not.toContain(m.id);
    expect(versionCount(m.id)).toBe(1);
  });
});

describe('billing', () => {
  it('makes models read-only once the trial has ended, but still lets a widget be taken down', async () => {
    const firm = await newFirm(appUrl, 'studio-lapsed');
    const a = (await addMember(appUrl, mailboxUrl, firm.owner, 'author')).client;
    const c = (await addMember(appUrl, mailboxUrl, firm.owner, 'checker')).client;
    const m = await create(a, 'formula');
    const v = (await save(a, m.id, 0, m.draft)).body.version;
    await c.json('POST', `/api/versions/${v.id}/check`, { decision: 'sign_off', note: 'ok' });
    const w = (await a.json<{ widget: { id: string } }>('POST', '/api/widgets', { modelId: m.id, versionId: v.id, title: 'Pump', panels: ['headline'], headline: 'mean', dialIds: [] })).body.widget;
    // The trial runs 14 days from the firm's creation when no seats were bought.
    const firmId = (db.prepare("select m.firm_id from memberships m join users u on u.id = m.user_id where u.email = ?").get(firm.email) as { firm_id: string }).firm_id;
    db.prepare('update firms set created_at = ? where id = ?').run(new Date(Date.now() - 30 * 86_400_000).toISOString(), firmId);
    db.prepare('update billing_accounts set trial_ends_at = ? where firm_id = ?').run(new Date(Date.now() - 16 * 86_400_000).toISOString(), firmId);
    const blocked = await save(a, m.id, 1, m.draft);
    expect(blocked.status).toBe(403);
    expect(blocked.body.error.message).toMatch(/read-only/);
    expect((await a.json('POST', '/api/models', { title: 'New', template: 'formula', start: 'blank' })).status).toBe(403);
    expect((await a.get(`/api/models/${m.id}`)).status).toBe(200);
    expect((await a.request('DELETE', `/api/widgets/${w.id}`)).status).toBe(204);
    expect(versionCount(m.id)).toBe(1);
  });
});

