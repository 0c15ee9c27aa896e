import { z } from 'zod';
import { validateModel, type CheckedModel } from '@/lib/core/engine/schema';
import { PANEL_IDS } from '@/lib/core/models/widget-options';
import { TEMPLATE_IDS } from '@/lib/core/models/templates';

// Request bodies of the studio's API. The model itself is checked by the engine's own schema and whole-model
// rules, so the same paths come back from the browser's editor and from the server (prefixed with "model.").

/**
 * A model field: anything in, a validated model out. Every issue the engine finds is reported under this
 * field's path, e.g. `model.contributors.2.plusTol`.
 */
export const modelField = z.unknown().transform((value, ctx): CheckedModel => {
  if (value === undefined || value === null) {
    ctx.addIssue({ code: 'custom', message: 'The model is required.' });
    return z.NEVER;
  }
  const r = validateModel(value);
  if (!r.ok) {
    for (const issue of r.issues) ctx.addIssue({ code: 'custom', path: issue.path, message: issue.message });
    return z.NEVER;
  }
  return r.model;
});

const title = z.string({ error: 'The title is required.' }).trim().min(1, 'The title is required.').max(120, 'The title is at most 120 characters.');

export const templateSchema = z.enum(TEMPLATE_IDS, { error: "The template is 'linear-stack', 'cost-range' or 'formula'." });

export const createModelSchema = z
  .object({
    title: title.optional(),
    template: templateSchema,
    start: z.enum(['example', 'blank', 'import'], { error: "Start from 'example', 'blank' or 'import'." }),
    model: z.unknown().optional(),
  })
  .superRefine((b, ctx) => {
    if (b.start !== 'import' && !b.title) ctx.addIssue({ code: 'custom', path: ['title'], message: 'The title is required.' });
    if (b.start === 'import' && b.model === undefined) ctx.addIssue({ code: 'custom', path: ['model'], message: 'Choose a model file to import.' });
  })
  .transform((b, ctx) => {
    if (b.start !== 'import') return { title: b.title!, template: b.template, start: b.start, model: null };
    const parsed = modelField.safeParse(b.model);
    if (!parsed.success) {
      for (const issue of parsed.error.issues) ctx.addIssue({ code: 'custom', path: ['model', ...issue.path.map((p) => (typeof p === 'symbol' ? String(p) : p))], message: issue.message });
      return z.NEVER;
    }
    if (parsed.data.template !== b.template) {
      ctx.addIssue({ code: 'custom', path: ['model', 'template'], message: `This file holds a ${parsed.data.template} model, not a ${b.template} model; choose that template or another file.` });
      return z.NEVER;
    }
    return { title: b.title ?? parsed.data.title, template: b.template, start: b.start, model: parsed.data };
  });
export type CreateModelInput = z.output<typeof createModelSchema>;

export const patchModelSchema = z.object({ archived: z.boolean({ error: 'Say whether the model is archived (true or false).' }) });

export const duplicateModelSchema = z.object({ title: title.optional() });

export const saveVersionSchema = z.object({
  /** The latest version number the author's edit started from; 0 (or null) when the model had none. */
  baseVersion: z
    .number({ error: 'Send the version number your edit started from (0 when there is none).' })
    .int('The base version is a whole number.')
    .min(0, 'The base version is 0 or more.')
    .nullable(),
  note: z.string().trim().max(2000, 'The note is at most 2,000 characters.').default(''),
  model: modelField,
});
export type SaveVersionInput = z.output<typeof saveVersionSchema>;

export const checkSchema = z
  .object({
    decision: z.enum(['sign_off', 'send_back'], { error: "The decision is 'sign_off' or 'send_back'." }),
    note: z.string().trim().max(4000, 'The note is at most 4,000 characters.').default(''),
    comments: z
      .array(
        z.object({
          path: z.string().max(300, 'A comment’s field path is at most 300 characters.'),
          text: z.string().trim().min(1, 'A comment cannot be empty.').max(2000, 'A comment is at most 2,000 characters.'),
        }),
      )
      .max(200, 'At most 200 comments.')
      .default([]),
  })
  .superRefine((b, ctx) => {
    if (b.decision === 'send_back' && !b.note && b.comments.length === 0) {
      ctx.addIssue({ code: 'custom', path: ['note'], message: 'Say what needs to change: write a note or comment on a field before sending the version back.' });
    }
  });
export type CheckInput = z.output<typeof checkSchema>;

const uniqueList = <T extends z.ZodType<string>>(item: T, what: string, max: number) =>
  z
    .array(item)
    .max(max, `At most ${max} ${what}.`)
    .superRefine((list, ctx) => {
      const seen = new Set<string>();
      list.forEach((v, i) => {
        if (seen.has(v)) ctx.addIssue({ code: 'custom', path: [i], message: `'${v}' is listed twice.` });
        seen.add(v);
      });
    });

const widgetFields = {
  title,
  panels: uniqueList(z.enum(PANEL_IDS, { error: `A panel is one of ${PANEL_IDS.join(', ')}.` }), 'panels', PANEL_IDS.length).refine((p) => p.length > 0, {
    error: 'Show at least one panel.',
  }),
  headline: z.string({ error: 'Choose the headline figure.' }).min(1, 'Choose the headline figure.').max(32),
  dialIds: uniqueList(z.string().min(1).max(64), 'dials', 50),
  brandColor: z.string().regex(/^#[0-9a-fA-F]{6}$/, 'The colour is a hex value such as #1f887b.'),
  showLogo: z.boolean(),
};

export const publishSchema = z.object({
  modelId: z.uuid('Choose the model to publish.'),
  versionId: z.uuid('Choose the version to publish.'),
  ...widgetFields,
  brandColor: widgetFields.brandColor.optional(),
  showLogo: widgetFields.showLogo.default(true),
});
export type PublishInput = z.output<typeof publishSchema>;

export const widgetPatchSchema = z
  .object({
    versionId: z.uuid('Choose the version to publish.').optional(),
    title: widgetFields.title.optional(),
    panels: widgetFields.panels.optional(),
    headline: widgetFields.headline.optional(),
    dialIds: widgetFields.dialIds.optional(),
    brandColor: widgetFields.brandColor.optional(),
    showLogo: widgetFields.showLogo.optional(),
  })
  .refine((p) => Object.values(p).some((v) => v !== undefined), { error: 'Change at least one thing.' });
export type WidgetPatchInput = z.output<typeof widgetPatchSchema>;
