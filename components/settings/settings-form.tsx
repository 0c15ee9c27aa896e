'use client';

import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { useForm, useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { settingsSchema } from '@/lib/core/auth/schemas';
import { applyServerErrors } from '@/lib/client/api';
import { useSettings, type FirmSettings } from '@/components/hooks/use-settings';
import { Button } from '@/components/ui/button';
import { Checkbox, Select, TextField } from '@/components/ui/field';
import { FormError } from '@/components/ui/form-error';
import { Banner } from '@/components/ui/banner';
import { Card } from '@/components/ui/card';
import { Loading } from '@/components/ui/loading';
import { LoadError } from '@/components/ui/load-error';
import { contrastRatio } from './contrast';

const formSchema = settingsSchema.required();
type In = z.input<typeof formSchema>;
type Out = z.output<typeof formSchema>;
const FIELDS = ['name', 'unitsDefault', 'currencyDefault', 'brandColor', 'requireCheck', 'paperSize'] as const;

const UNIT_OPTIONS = [
  { value: 'mm', label: 'Millimetres (mm)' },
  { value: 'um', label: 'Micrometres (µm)' },
  { value: 'in', label: 'Inches (in)' },
];

const PAPER_OPTIONS = [
  { value: 'A4', label: 'A4 (210 × 297 mm)' },
  { value: 'Letter', label: 'Letter (8.5 × 11 in)' },
];

function BrandPreview({ colour }: { colour: string }) {
  // The swatch's text is large (24 px bold), so WCAG AA asks 3:1 of it; the verdict below names both levels.
  const white = contrastRatio(colour, '#ffffff');
  const dark = contrastRatio(colour, '#141c22');
  if (white === null || dark === null) {
    return (
      <div className="flex flex-wrap items-center gap-3">
        <div aria-hidden="true" className="st-grid h-12 w-20 flex-none rounded-md border border-dashed border-ink-400 bg-white" />
        <p className="text-[0.8125rem] text-ink-600">The swatch appears once the colour is a six-digit hex value.</p>
      </div>
    );
  }
  const best = white >= dark ? { text: '#ffffff', ratio: white, name: 'white' } : { text: '#141c22', ratio: dark, name: 'dark' };
  const verdict =
    best.ratio >= 4.5
      ? 'meets WCAG AA for text of any size.'
      : best.ratio >= 3
        ? 'meets WCAG AA for large text and chart marks (3:1) but not for small text (4.5:1).'
        : 'below WCAG AA even for large text: choose a darker or lighter colour.';
  return (
    <div className="flex flex-wrap items-center gap-3">
      <div
        aria-hidden="true"
        className="num flex h-12 w-20 flex-none items-center justify-center rounded-md border border-ink-300 text-2xl font-bold shadow-inner"
        style={{ backgroundColor: colour, color: best.text }}
      >
        P80
      </div>
      <p className="min-w-0 flex-1 basis-56 text-[0.8125rem] text-ink-600">
        Swatch with {best.name} text, contrast <span className="num text-ink-900">{best.ratio.toFixed(1)}:1</span>: {verdict}
      </p>
    </div>
  );
}

function SettingsFields({ initial, canEdit, onSave }: { initial: FirmSettings; canEdit: boolean; onSave: (patch: Partial<FirmSettings>) => Promise<FirmSettings> }) {
  const router = useRouter();
  const [formMessages, setFormMessages] = useState<string[]>([]);
  const [saved, setSaved] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    setValue,
    control,
    reset,
    formState: { errors, isSubmitting, dirtyFields },
  } = useForm<In, unknown, Out>({ resolver: zodResolver(formSchema), defaultValues: initial });

  const colour = useWatch({ control, name: 'brandColor' }) ?? '';
  const validColour = /^#[0-9a-fA-F]{6}$/.test(colour);

  const submit = handleSubmit(async (values) => {
    setFormMessages([]);
    setSaved(null);
    const patch: Partial<FirmSettings> = {};
    for (const k of FIELDS) if (dirtyFields[k]) Object.assign(patch, { [k]: values[k] });
    if (!Object.keys(patch).length) {
      setSaved('Nothing to save: no setting has changed.');
      return;
    }
    try {
      const next = await onSave(patch);
      reset(next);
      setSaved('Settings saved.');
      if ('name' in patch) router.refresh(); // the firm name also sits in the navigation
    } catch (err) {
      setFormMessages(applyServerErrors(err, setError, FIELDS));
    }
  });

  return (
    <form onSubmit={submit} noValidate className="space-y-6">
      {!canEdit ? (
        <Banner tone="info" title="Read only">
          Only the account owner can change these settings. They apply to every model and widget of your firm.
        </Banner>
      ) : null}
      <FormError messages={formMessages} />
      {saved ? <Banner tone="success">{saved}</Banner> : null}
      <fieldset disabled={!canEdit || isSubmitting} className="space-y-6">
        <Card title="Firm" as="h2">
          <TextField label="Firm name" autoComplete="organization" hint="Shown in the dashboard, in e-mails and on PDF snapshots." error={errors.name?.message} {...register('name')} className="max-w-md" />
        </Card>

        <Card title="Defaults for new models" as="h2">
          <div className="grid gap-4 sm:grid-cols-2">
            <Select label="Length units" options={UNIT_OPTIONS} hint="Used for new tolerance stack-ups; each model can change it." error={errors.unitsDefault?.message} {...register('unitsDefault')} />
            <TextField
              label="Currency"
              hint="Three-letter ISO 4217 code, e.g. EUR, GBP or USD. Used for new cost ranges."
              maxLength={3}
              autoCapitalize="characters"
              spellCheck={false}
              inputClassName="num uppercase"
              controlWidth="w-28"
              error={errors.currencyDefault?.message}
              {...register('currencyDefault', { setValueAs: (v: string) => String(v ?? '').trim().toUpperCase() })}
            />
          </div>
        </Card>

        <Card title="Branding and snapshots" as="h2" description="Widgets in your clients’ portals and PDF snapshots carry your accent colour.">
          <div className="space-y-4">
            <TextField
              label="Brand colour"
              hint="A hex colour such as #1f887b, or pick one."
              maxLength={7}
              spellCheck={false}
              inputClassName="num"
              controlWidth="w-32"
              error={errors.brandColor?.message}
              {...register('brandColor')}
              after={
                <input
                  type="color"
                  aria-label="Colour picker"
                  value={validColour ? colour.toLowerCase() : '#1f887b'}
                  onChange={(e) => setValue('brandColor', e.target.value, { shouldDirty: true, shouldValidate: true })}
                  className="h-10 w-12 cursor-pointer rounded-md border border-ink-400 bg-white p-1 disabled:cursor-not-allowed"
                />
              }
            />
            <BrandPreview colour={colour} />
            <Select label="PDF paper size" options={PAPER_OPTIONS} error={errors.paperSize?.message} {...register('paperSize')} className="max-w-xs" />
          </div>
        </Card>

        <Card title="Publishing rule" as="h2">
          <Checkbox
            label="Only checked versions can be published"
            hint="When on, a checker must sign off a version before it can be published to a client. Turn it off only if your quality procedure allows releases without a second engineer’s check."
            error={errors.requireCheck?.message}
            {...register('requireCheck')}
          />
        </Card>
      </fieldset>
      {canEdit ? (
        <div className="flex items-center gap-3">
          <Button type="submit" pending={isSubmitting} pendingLabel="Saving…">
            Save settings
          </Button>
        </div>
      ) : null}
    </form>
  );
}

export function SettingsForm({ canEdit }: { canEdit: boolean }) {
  const settings = useSettings();
  if (settings.error) return <LoadError error={settings.error} what="the settings" onRetry={() => settings.mutate()} />;
  if (!settings.data) return <Loading>Loading settings…</Loading>;
  return <SettingsFields initial={settings.data} canEdit={canEdit} onSave={settings.save} />;
}
