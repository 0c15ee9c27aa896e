'use client';

import { useId, useState, forwardRef, type ComponentProps } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { ApiError, errorMessage } from '@/lib/client/api';
import { clientCreateSchema, domainsField, originsField, splitLines } from '@/lib/core/embed/schemas';
import { Button } from '@/components/ui/button';
import { TextField, FieldError, Checkbox, controlClasses } from '@/components/ui/field';
import { FormError } from '@/components/ui/form-error';
import type { ClientBody } from './use-clients';

// Create or edit a client: allowed origins and e-mail domains are typed one per line and checked as typed.

const lines = (field: typeof originsField) =>
  z.string().transform((s, ctx) => {
    const r = field.safeParse(splitLines(s));
    if (!r.success) {
      for (const issue of r.error.issues) ctx.addIssue({ code: 'custom', message: issue.message });
      return z.NEVER;
    }
    return r.data;
  });

const formSchema = z.object({
  name: clientCreateSchema.shape.name,
  origins: lines(originsField),
  domains: lines(domainsField),
  anyAddress: z.boolean(),
  note: z.string().trim().max(500, 'Use at most 500 characters.'),
});

type In = z.input<typeof formSchema>;
type Out = z.output<typeof formSchema>;
const FIELD_OF: Record<string, keyof In> = { name: 'name', allowedOrigins: 'origins', allowedEmailDomains: 'domains', snapshotAnyAddress: 'anyAddress', note: 'note' };

type TextAreaProps = ComponentProps<'textarea'> & { label: string; hint?: string; error?: string };

const TextArea = forwardRef<HTMLTextAreaElement, TextAreaProps>(function TextArea({ label, hint, error, id, ...rest }, ref) {
  const auto = useId().replace(/[^a-zA-Z0-9_-]/g, '');
  const inputId = id ?? `ta${auto}`;
  const describedBy = [error ? `${inputId}-error` : null, hint ? `${inputId}-hint` : null].filter(Boolean).join(' ') || undefined;
  return (
    <div>
      <label htmlFor={inputId} className="mb-1 block text-sm font-medium text-ink-800">
        {label}
      </label>
      <textarea ref={ref} id={inputId} rows={3} aria-invalid={error ? true : undefined} aria-describedby={describedBy} className={controlClasses(Boolean(error), 'num py-2 text-sm')} {...rest} />
      {error ? <FieldError id={`${inputId}-error`}>{error}</FieldError> : null}
      {hint ? (
        <p id={`${inputId}-hint`} className="mt-1 text-[0.8125rem] leading-snug text-ink-600">
          {hint}
        </p>
      ) : null}
    </div>
  );
});

export interface ClientFormProps {
  initial?: { name: string; allowedOrigins: string[]; allowedEmailDomains: string[]; snapshotAnyAddress: boolean; note: string | null };
  submitLabel: string;
  onSubmit: (body: ClientBody) => Promise<unknown>;
  onCancel?: () => void;
}

export function ClientForm({ initial, submitLabel, onSubmit, onCancel }: ClientFormProps) {
  const [formMessages, setFormMessages] = useState<string[]>([]);
  const {
    register,
    handleSubmit,
    control,
    setError,
    reset,
    formState: { errors, isSubmitting },
  } = useForm<In, unknown, Out>({
    resolver: zodResolver(formSchema),
    defaultValues: {
      name: initial?.name ?? '',
      origins: initial?.allowedOrigins.join('\n') ?? '',
      domains: initial?.allowedEmailDomains.join('\n') ?? '',
      anyAddress: initial?.snapshotAnyAddress ?? false,
      note: initial?.note ?? '',
    },
  });

  const anyAddress = useWatch({ control, name: 'anyAddress' });

  const submit = handleSubmit(async (v) => {
    setFormMessages([]);
    try {
      await onSubmit({ name: v.name, allowedOrigins: v.origins, allowedEmailDomains: v.domains, snapshotAnyAddress: v.anyAddress, note: v.note });
      if (!initial) reset();
    } catch (err) {
      // Server paths such as "allowedOrigins.1" belong to the textarea of the whole list.
      if (err instanceof ApiError && err.fields) {
        const rest: string[] = [];
        for (const [path, msgs] of Object.entries(err.fields)) {
          const f = FIELD_OF[path.split('.')[0]!];
          if (f) setError(f, { type: 'server', message: msgs.join(' ') });
          else rest.push(...msgs);
        }
        setFormMessages(rest.length ? rest : []);
      } else setFormMessages([errorMessage(err)]);
    }
  });

  return (
    <form onSubmit={submit} noValidate className="space-y-4">
      <FormError messages={formMessages} fieldErrorCount={Object.keys(errors).length} />
      <TextField label="Client name" autoComplete="organization" placeholder="e.g. Fernhollow Water Board" error={errors.name?.message} {...register('name')} />
      <TextArea
        label="Allowed origins"
        placeholder={'https://portal.fernhollow.example\nhttps://intranet.fernhollow.example:8443'}
        hint="The exact web addresses (scheme://host[:port], no path) of the pages that may show this client’s widgets, one per line. Any other site gets a blank frame."
        error={errors.origins?.message}
        {...register('origins')}
      />
      <TextArea
        label="Allowed e-mail domains"
        placeholder="fernhollow.example"
        hint="Viewers with addresses at these domains may have PDF snapshots e-mailed to them. One per line; leave empty to allow none."
        error={errors.domains?.message}
        {...register('domains')}
      />
      <Checkbox
        label="Send snapshots to any e-mail address"
        hint="Not recommended: anyone who can see the widget could have its figures e-mailed anywhere, and the widget becomes a way to send mail in your firm’s name. The domains above are ignored while this is on."
        error={errors.anyAddress?.message}
        {...register('anyAddress')}
      />
      {anyAddress ? (
        <p role="alert" className="rounded-md border border-warn-600/30 border-l-4 border-l-warn-600 bg-warn-50 px-3 py-2 text-[0.8125rem] text-ink-800">
          Warning: snapshots of this client’s widgets will go to any address a viewer types.
        </p>
      ) : null}
      <TextField label="Note (optional)" placeholder="Contact, contract reference…" error={errors.note?.message} {...register('note')} />
      <div className="flex flex-wrap gap-2">
        <Button type="submit" pending={isSubmitting} pendingLabel="Saving…">
          {submitLabel}
        </Button>
        {onCancel ? (
          <Button variant="ghost" onClick={onCancel} disabled={isSubmitting}>
            Cancel
          </Button>
        ) : null}
      </div>
    </form>
  );
}
