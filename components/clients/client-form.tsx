'use client';

import { useId, useState, forwardRef, type ComponentProps } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { ApiError, errorMessage } from '@/lib/client/api';
import { clientCreateSchema, domainsField, originsField, splitLines } from '@/lib/embed/schemas';
import { Button } from '@/components/ui/button';
import { TextField, FieldError, controlClasses } from '@/components/ui/field';
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
  note: z.string().trim().max(500, 'Use at most 500 characters.'),
});

type In = z.input<typeof formSchema>;
type Out = z.output<typeof formSchema>;
const FIELD_OF: Record<string, keyof In> = { name: 'name', allowedOrigins: 'origins', allowedEmailDomains: 'domains', note: 'note' };

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
  initial?: { name: string; allowedOrigins: string[]; allowedEmailDomains: string[]; note: string | null };
  submitLabel: string;
  onSubmit: (body: ClientBody) => Promise<unknown>;
  onCancel?: () => void;
}

export function ClientForm({ initial, submitLabel, onSubmit, onCancel }: ClientFormProps) {
  const [formMessages, setFormMessages] = useState<string[]>([]);
  const {
    register,
    handleSubmit,
    setError,
    reset,
    formState: { errors, isSubmitting },
  } = useForm<In, unknown, Out>({
    resolver: zodResolver(formSchema),
    defaultValues: {
      name: initial?.name ?? '',
      origins: initial?.allowedOrigins.join('\n') ?? '',
      domains: initial?.allowedEmailDomains.join('\n') ?? '',
      note: initial?.note ?? '',
    },
  });

  const submit = handleSubmit(async (v) => {
    setFormMessages([]);
    try {
      await onSubmit({ name: v.name, allowedOrigins: v.origins, allowedEmailDomains: v.domains, note: v.note });
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
