// A snapshot parses its model once: the stored version is a CheckedModel from the database read on, the request and
// the PDF's content use it as it is, and the run checks only the model with the viewer's dial values applied.
// The count is of schema parses (modelSchema.safeParse, which validateModel runs), on this thread.
import { afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { useFreshDb } from '../../support/test-db';
import { modelSchema } from '@/lib/core/engine/schema';
import { runCheckedModelSync, runModelSync } from '@/lib/core/engine';
import { requestSnapshot } from '@/lib/server/snapshots/request';
import { snapshotContent } from '@/lib/server/snapshots/content';
import { seedWidget, viewerFor } from './fixture';

beforeAll(async () => {
  await useFreshDb();
});

afterEach(() => {
  vi.restoreAllMocks();
});

const dials = { spacer_length: 24.2, float_max: 0.45 };
const pinned = { spacer_length: 24.08, float_max: 0.5 };

describe('one snapshot, one parse of its model', () => {
  it('the request checks the dial values against the stored model without parsing it again', async () => {
    const v = await viewerFor(await seedWidget());
    const parse = vi.spyOn(modelSchema, 'safeParse');
    await requestSnapshot(v, { email: 'a@client.example', dialValues: dials, pinnedDialValues: pinned }, 'requester-parse');
    expect(parse).toHaveBeenCalledTimes(0);
  });

  it('a run of the checked model parses only the model with the dial values applied; the content parses nothing', async () => {
    const v = await viewerFor(await seedWidget());
    const model = v.widget.model;
    const parse = vi.spyOn(modelSchema, 'safeParse');
    const result = runCheckedModelSync(model, { dialValues: dials });
    const pinnedResult = runCheckedModelSync(model, { dialValues: pinned });
    expect(parse).toHaveBeenCalledTimes(2);
    parse.mockClear();
    snapshotContent(model, result, {
      firmName: 'Orrinvale',
      brandColor: '#1f887b',
      paperSize: 'A4',
      widgetTitle: 'Float',
      clientName: 'Harbour Pumps Ltd',
      requestedAt: '2026-12-03T10:00:00Z',
      versionNumber: 2,
      checkState: 'signed_off',
      checkedAt: '2026-12-03T09:00:00Z',
      checkerName: null,
      authorName: null,
      panels: ['headline', 'spread'],
      headline: 'mean',
      dialIds: Object.keys(dials),
    }, pinnedResult);
    expect(parse).toHaveBeenCalledTimes(0);
  });

  it('gives the same numbers as a run that parses the model first', async () => {
    const v = await viewerFor(await seedWidget());
    const parse = vi.spyOn(modelSchema, 'safeParse');
    const unparsed = runModelSync(JSON.parse(JSON.stringify(v.widget.model)), { dialValues: dials });
    // The general entry (the API's run body) parses the model as sent, then the model with the dials applied.
    expect(parse).toHaveBeenCalledTimes(2);
    const checked = runCheckedModelSync(v.widget.model, { dialValues: dials });
    expect(checked.outputs).toEqual(unparsed.outputs);
  });
});
