import { describe, it, expect, inject, beforeAll } from 'vitest';
import { Client } from '../../support/http-client';
import { newFirm } from '../../support/firms';
import { exampleLinearStack, exampleCostRange, exampleFormula, runModelSync } from '../../../lib/core/engine';

const appUrl = inject('appUrl');
const small = <T extends { settings: { trials: number } }>(m: T, trials = 5000): T => ({ ...m, settings: { ...m.settings, trials } });

describe('POST /api/v1/simulate', () => {
  let owner: Client;
  let key: string;
  beforeAll(async () => {
    owner = (await newFirm(appUrl, 'simulate')).owner;
    const created = await owner.json<{ key: { secret: string } }>('POST', '/api/api-keys', { name: 'CI pipeline' });
    expect(created.status).toBe(201);
    key = created.body.key.secret;
  });

  const callWithKey = (body: unknown, k = key) =>
    fetch(`${appUrl}/api/v1/simulate`, { method: 'POST', headers: { authorization: `Bearer ${k}`, 'content-type': 'application/json' }, body: JSON.stringify(body) });

  it('gives the same statistics as the engine in-process, for every template', async () => {
    for (const model of [small(exampleLinearStack), small(exampleCostRange), small(exampleFormula)]) {
      const res = await owner.json<{ outputs: { mean: number; percentiles: unknown }[] }>('POST', '/api/v1/simulate', { model });
      expect(res.status).toBe(200);
      const local = runModelSync(model);
      expect(res.body.outputs.map((o) => o.mean)).toEqual(local.outputs.map((o) => o.mean));
      expect(res.body.outputs.map((o) => o.percentiles)).toEqual(JSON.parse(JSON.stringify(local.outputs.map((o) => o.percentiles))));
    }
  });

  it('accepts a firm API key, returns samples when asked, and refuses a revoked key', async () => {
    const res = await callWithKey({ model: small(exampleLinearStack), samples: { which: 'outputs', limit: 1234 } });
    expect(res.status).toBe(200);
    const body = (await res.json()) as { samples: { outputs: Record<string, number[]> } };
    const cols = Object.values(body.samples.outputs);
    expect(cols[0]).toHaveLength(1234);
    const keys = await owner.json<{ keys: { id: string; prefix: string }[] }>('GET', '/api/api-keys');
    const id = keys.body.keys.find((k) => key.startsWith(k.prefix))!.id;
    expect((await owner.del(`/api/api-keys/${id}`)).status).toBe(204);
    expect((await callWithKey({ model: small(exampleLinearStack) })).status).toBe(401);
    expect((await callWithKey({ model: small(exampleLinearStack) }, 'stk_not-a-real-key-at-all-000000')).status).toBe(401);
  });

  it('names every bad field of a bad model with its path', async () => {
    const bad = structuredClone(small(exampleLinearStack)) as unknown as { contributors: { minusTol: number; plusTol: number }[]; settings: { trials: number } };
    bad.contributors[1]!.minusTol = -0.1;
    bad.settings.trials = 10;
    const res = await owner.json<{ error: { fields: Record<string, string[]> } }>('POST', '/api/v1/simulate', { model: bad });
    expect(res.status).toBe(422);
    expect(Object.keys(res.body.error.fields)).toEqual(expect.arrayContaining(['model.contributors.1.minusTol', 'model.settings.trials']));
  });

  it('refuses an unknown name in a formula, and too many samples', async () => {
    const f = structuredClone(small(exampleFormula)) as unknown as { outputs: { formula: string }[] };
    f.outputs[0]!.formula = 'nonexistent_input * 2';
    const res = await owner.json<{ error: { fields: Record<string, string[]> } }>('POST', '/api/v1/simulate', { model: f });
    expect(res.status).toBe(422);
    expect(JSON.stringify(res.body.error.fields)).toMatch(/nonexistent_input/);
    const many = await owner.json<{ error: { fields: Record<string, string[]> } }>('POST', '/api/v1/simulate', { model: small(exampleLinearStack), samples: { which: 'outputs', limit: 100_001 } });
    expect(many.status).toBe(422);
    expect(Object.keys(many.body.error.fields)).toEqual(['samples.limit']);
  });
});
