'use client';

import { useRouter } from 'next/navigation';
import { useId, useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { Button, Card, FieldError, FormError, TextField, cx } from '@/components/ui';
import { ApiError, applyServerErrors, errorMessage } from '@/lib/client/api';
import { findJsonSyntaxError } from '@/lib/core/models/json-io';
import { TEMPLATE_IDS, TEMPLATE_LABELS, TEMPLATE_SUMMARIES } from '@/lib/core/models/templates';
import type { TemplateId } from '@/lib/core/models/types';
import { useModels } from './use-models';

const formSchema = z
  .object({
    title: z.string().trim().max(120, 'The title is at most 120 characters.'),
    template: z.enum(TEMPLATE_IDS),
    start: z.enum(['example', 'blank', 'import']),
  })
  .superRefine((v, ctx) => {
    if (v.start !== 'import' && !v.title) ctx.addIssue({ code: 'custom', path: ['title'], message: 'Give the model a title.' });
  });
type FormIn = z.input<typeof formSchema>;
type FormOut = z.output<typeof formSchema>;

const START_LABELS = {
  example: { label: 'Worked example', hint: 'A complete model to edit: the quickest way to see every field in use.' },
  blank: { label: 'Blank', hint: 'One row to overwrite, with your firm’s default units and currency.' },
  import: { label: 'Import a file', hint: 'A model exported from Stochos as JSON (schema stochos.model/1).' },
} as const;

/** Create a model from a template: the worked example, a blank one, or an imported JSON file. */
export function NewModelPanel({ onClose }: { onClose: () => void }) {
  const router = useRouter();
  const { create } = useModels(false);
  const [formMessages, setFormMessages] = useState<string[]>([]);
  const [fileText, setFileText] = useState<{ name: string; text: string } | null>(null);
  const [fileError, setFileError] = useState<string | null>(null);
  const [importIssues, setImportIssues] = useState<string[]>([]);
  const fileId = useId();
  const {
    register,
    handleSubmit,
    setError,
    control,
    formState: { errors, isSubmitting },
  } = useForm<FormIn, unknown, FormOut>({ resolver: zodResolver(formSchema), defaultValues: { title: '', template: 'linear-stack', start: 'example' } });
  const template = useWatch({ control, name: 'template' });
  const start = useWatch({ control, name: 'start' });

  const submit = handleSubmit(async (values) => {
    setFormMessages([]);
    setImportIssues([]);
    setFileError(null);
    let model: unknown;
    if (values.start === 'import') {
      if (!fileText) {
        setFileError('Choose a model file to import.');
        return;
      }
      const syntax = findJsonSyntaxError(fileText.text);
      if (syntax) {
        setFileError(`${fileText.name} is not valid JSON: line ${syntax.line}, column ${syntax.column}: ${syntax.message}`);
        return;
      }
      model = JSON.parse(fileText.text);
    }
    try {
      const created = await create({ title: values.title || undefined, template: values.template, start: values.start, model });
      router.push(`/app/models/${created.id}`);
    } catch (err) {
      if (err instanceof ApiError && err.fields) {
        // Problems inside the imported file belong beside the file input, each with its place in the file.
        const inFile = Object.entries(err.fields).filter(([k]) => k === 'model' || k.startsWith('model.'));
        if (inFile.length) setImportIssues(inFile.map(([k, msgs]) => `${k === 'model' ? 'The file' : k.slice('model.'.length)}: ${msgs.join(' ')}`));
        const rest = Object.fromEntries(Object.entries(err.fields).filter(([k]) => !(k === 'model' || k.startsWith('model.'))));
        const left = applyServerErrors(new ApiError(err.status, err.code, err.message, { fields: rest }), setError, ['title', 'template', 'start']);
        setFormMessages(inFile.length && !Object.keys(rest).length ? [] : left);
      } else setFormMessages([errorMessage(err)]);
    }
  });

  return (
    <Card
      title="New model"
      description="Choose a template and how to start. Nothing is shared until a version is saved, checked and published."
      actions={
        <Button variant="ghost" size="sm" onClick={onClose}>
          Cancel
        </Button>
      }
    >
      <form onSubmit={submit} noValidate className="space-y-5">
        <FormError messages={formMessages} />
        <fieldset>
          <legend className="mb-2 text-sm font-medium text-ink-800">Template</legend>
          <div className="grid gap-2 md:grid-cols-3">
            {TEMPLATE_IDS.map((t: TemplateId) => (
              <label
                key={t}
                className={cx(
                  'flex cursor-pointer gap-2.5 rounded-md border p-3 text-sm focus-within:ring-2 focus-within:ring-accent-600',
                  template === t ? 'border-accent-600 bg-accent-50' : 'border-ink-200 bg-white hover:border-ink-400',
                )}
              >
                <input type="radio" value={t} {...register('template')} className="mt-1 accent-accent-700" />
                <span>
                  <span className="block font-semibold text-ink-900">{TEMPLATE_LABELS[t]}</span>
                  <span className="mt-0.5 block text-ink-600">{TEMPLATE_SUMMARIES[t]}</span>
                </span>
              </label>
            ))}
          </div>
        </fieldset>
        <fieldset>
          <legend className="mb-2 text-sm font-medium text-ink-800">Start from</legend>
          <div className="grid gap-2 md:grid-cols-3">
            {(Object.keys(START_LABELS) as (keyof typeof START_LABELS)[]).map((s) => (
              <label
                key={s}
                className={cx(
                  'flex cursor-pointer gap-2.5 rounded-md border p-3 text-sm focus-within:ring-2 focus-within:ring-accent-600',
                  start === s ? 'border-accent-600 bg-accent-50' : 'border-ink-200 bg-white hover:border-ink-400',
                )}
              >
                <input type="radio" value={s} {...register('start')} className="mt-1 accent-accent-700" />
                <span>
                  <span className="block font-semibold text-ink-900">{START_LABELS[s].label}</span>
                  <span className="mt-0.5 block text-ink-600">{START_LABELS[s].hint}</span>
                </span>
              </label>
            ))}
          </div>
        </fieldset>
        {start === 'import' ? (
          <div>
            <label htmlFor={fileId} className="mb-1 block text-sm font-medium text-ink-800">
              Model file (.json)
            </label>
            <input
              id={fileId}
              type="file"
              accept="application/json,.json"
              aria-invalid={fileError || importIssues.length ? true : undefined}
              aria-describedby={fileError || importIssues.length ? `${fileId}-error` : undefined}
              className="block text-sm text-ink-800 file:mr-3 file:rounded-md file:border file:border-ink-300 file:bg-white file:px-3 file:py-1.5 file:text-sm file:font-medium"
              onChange={async (e) => {
                setFileError(null);
                setImportIssues([]);
                const f = e.target.files?.[0];
                setFileText(f ? { name: f.name, text: await f.text() } : null);
              }}
            />
            <div id={`${fileId}-error`}>
              {fileError ? <FieldError>{fileError}</FieldError> : null}
              {importIssues.length ? (
                <FieldError>
                  The file does not hold a valid {TEMPLATE_LABELS[template]} model; nothing was created:
                  <ul className="mt-1 list-disc pl-5 font-normal">
                    {importIssues.map((m) => (
                      <li key={m}>{m}</li>
                    ))}
                  </ul>
                </FieldError>
              ) : null}
            </div>
          </div>
        ) : null}
        <TextField
          label="Title"
          hint={start === 'import' ? 'Leave empty to keep the title in the file.' : 'Clients see it on the widget, so name the part or the project.'}
          placeholder={template === 'cost-range' ? 'e.g. Footbridge refurbishment, stage 2 estimate' : template === 'linear-stack' ? 'e.g. Pump shaft: bearing axial float' : 'e.g. Booster pump motor load'}
          error={errors.title?.message}
          {...register('title')}
        />
        <div className="flex flex-wrap gap-2">
          <Button type="submit" pending={isSubmitting} pendingLabel="Creating…">
            Create and open
          </Button>
          <Button variant="secondary" onClick={onClose}>
            Cancel
          </Button>
        </div>
      </form>
    </Card>
  );
}
