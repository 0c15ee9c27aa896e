'use client';

import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { Button } from '@/components/ui/button';
import { Select, TextField } from '@/components/ui/field';
import { Banner } from '@/components/ui/banner';
import { Card } from '@/components/ui/card';
import { FieldError } from '@/components/ui/field';
import { ApiError, errorMessage, fieldMessage } from '@/lib/client/api';
import { uploadDataset } from './use-datasets';
import { columnError, readColumn, readCsv, readCsvText, type CsvTable } from '@/lib/core/datasets/csv';

type Source = { kind: 'file'; file: File; table: CsvTable } | { kind: 'text'; text: string; table: CsvTable };

// The upload's fields as the server names them in a 422; each message goes beside its control.
const FIELDS = ['file', 'column', 'name', 'unit', 'drop'] as const;

/** Upload a CSV or paste a column: the file is checked here first (same rules as the server), then sent. */
export function UploadForm() {
  const router = useRouter();
  const [source, setSource] = useState<Source | null>(null);
  const [readError, setReadError] = useState<string | null>(null);
  const [column, setColumn] = useState(0);
  const [name, setName] = useState('');
  const [unit, setUnit] = useState('');
  const [drop, setDrop] = useState<number[]>([]);
  const [paste, setPaste] = useState('');
  const [pending, setPending] = useState(false);
  const [serverError, setServerError] = useState<unknown>(null);

  function pickColumn(t: CsvTable): number {
    const i = t.headers.findIndex((_, c) => readColumn(t, c).values.length > 0);
    return i < 0 ? 0 : i;
  }

  async function onFile(file: File | undefined) {
    setServerError(null);
    setDrop([]);
    if (!file) return setSource(null);
    const r = readCsv(new Uint8Array(await file.arrayBuffer()), file.name);
    if (!r.ok) {
      setSource(null);
      return setReadError(r.message);
    }
    setReadError(null);
    setSource({ kind: 'file', file, table: r.table });
    setColumn(pickColumn(r.table));
    if (!name) setName(file.name.replace(/\.[^.]+$/, ''));
  }

  function onPaste() {
    setServerError(null);
    setDrop([]);
    const r = readCsvText(paste, 'Pasted column');
    if (!r.ok) {
      setSource(null);
      return setReadError(r.message);
    }
    setReadError(null);
    setSource({ kind: 'text', text: paste, table: r.table });
    setColumn(pickColumn(r.table));
  }

  const col = source ? readColumn(source.table, column, drop) : null;

  const allProblems = source ? readColumn(source.table, column).problems : [];
  const blocking = source && col ? columnError(source.kind === 'file' ? source.file.name : 'Pasted column', source.table.headers[column], col) : null;
  // A server message goes beside its control when that control is on screen, else in the banner.
  const shown: Record<(typeof FIELDS)[number], boolean> = { file: true, column: !!source, name: !!source, unit: !!source, drop: allProblems.length > 0 };
  const fieldErrors = Object.fromEntries(FIELDS.map((f) => [f, shown[f] ? fieldMessage(serverError, f) : undefined])) as Record<(typeof FIELDS)[number], string | undefined>;
  const placed = FIELDS.filter((f) => fieldErrors[f]).length;
  const elsewhere = serverError instanceof ApiError && serverError.fields ? Object.entries(serverError.fields).filter(([f]) => !fieldErrors[f as (typeof FIELDS)[number]]).flatMap(([, m]) => m) : [];

  async function submit(e: React.FormEvent) {
    e.preventDefault();
    if (!source) return;
    setPending(true);
    setServerError(null);
    const form = new FormData();
    form.set('name', name);
    form.set('unit', unit);
    form.set('column', String(column));
    form.set('drop', drop.join(','));
    if (source.kind === 'file') form.set('file', source.file);
    else form.set('text', source.text);
    try {
      const { id } = await uploadDataset(form);
      router.push(`/app/datasets/${id}`);
      router.refresh();
    } catch (err) {
      setServerError(err);
    } finally {
      setPending(false);
    }
  }

  return (
    <Card title="Add a dataset" description="Upload a CSV (at most 5 MB) or paste a column of measurements. Choose the column, name it and give its unit.">
      <form onSubmit={submit} className="space-y-4" aria-label="Add a dataset">
        <div className="grid gap-4 md:grid-cols-2">
          <div>
            <label htmlFor="dataset-file" className="block text-sm font-medium text-ink-800">
              CSV file
            </label>
            <input
              id="dataset-file"
              type="file"
              accept=".csv,text/csv,text/plain"
              className="mt-1 block w-full text-sm"
              aria-invalid={fieldErrors.file ? true : undefined}
              aria-describedby={fieldErrors.file ? 'dataset-file-error' : undefined}
              onChange={(e) => onFile(e.target.files?.[0])}
            />
            {fieldErrors.file && <FieldError id="dataset-file-error">{fieldErrors.file}</FieldError>}
          </div>
          <div>
            <label htmlFor="dataset-paste" className="block text-sm font-medium text-ink-800">
              Or paste a column
            </label>
            <textarea id="dataset-paste" rows={3} value={paste} onChange={(e) => setPaste(e.target.value)} className="mt-1 block w-full rounded-md border border-ink-300 p-2 font-mono text-sm" placeholder={'12.01\n11.98\n12.03'} />
            <Button variant="secondary" size="sm" className="mt-2" onClick={onPaste} disabled={!paste.trim()}>
              Use pasted values
            </Button>
          </div>
        </div>
        {readError && (
          <Banner tone="danger" title="This file cannot be used">
            {readError}
          </Banner>
        )}
        {source && (
          <>
            <div className="grid gap-4 md:grid-cols-3">
              <Select
                label="Column"
                value={String(column)}
                onChange={(e) => {
                  setColumn(Number(e.target.value));
                  setDrop([]);
                }}
                options={source.table.headers.map((h, i) => ({ value: String(i), label: h }))}
                error={fieldErrors.column}
              />
              <TextField label="Name" value={name} onChange={(e) => setName(e.target.value)} required maxLength={120} error={fieldErrors.name} />
              <TextField label="Unit" hint="e.g. mm, ratio" value={unit} onChange={(e) => setUnit(e.target.value)} maxLength={24} error={fieldErrors.unit} />
            </div>
            <p className="text-sm text-ink-700" aria-live="polite">
              <span className="font-mono">{col?.values.length ?? 0}</span> numbers read from {source.table.rows.length} rows
              {col?.decimalComma ? ' (decimal commas)' : ''}.
            </p>
            {allProblems.length > 0 && (
              <fieldset className="rounded-md border border-ink-200 p-3">
                <legend className="px-1 text-sm font-medium">Rows that are not numbers: tick each one to drop it</legend>
                <ul className="max-h-48 space-y-1 overflow-auto text-sm">
                  {allProblems.map((p) => (
                    <li key={p.row}>
                      <label className="flex items-center gap-2">
                        <input type="checkbox" checked={drop.includes(p.row)} onChange={(e) => setDrop((d) => (e.target.checked ? [...d, p.row] : d.filter((r) => r !== p.row)))} />
                        Row <span className="font-mono">{p.row}</span>: {p.reason}
                        {p.text ? <span className="font-mono text-ink-600">“{p.text}”</span> : null}
                      </label>
                    </li>
                  ))}
                </ul>
                {fieldErrors.drop && <FieldError>{fieldErrors.drop}</FieldError>}
              </fieldset>
            )}
            {blocking && <Banner tone="warn">{blocking}</Banner>}
          </>
        )}
        {serverError ? (
          <Banner tone="danger" title="Nothing was stored">
            {elsewhere.length ? elsewhere.join(' ') : placed ? `${placed === 1 ? 'One field needs' : `${placed} fields need`} attention: see the message beside it.` : errorMessage(serverError)}
          </Banner>
        ) : null}
        <Button type="submit" pending={pending} pendingLabel="Uploading…" disabled={!source || !!blocking || !name.trim()}>
          Store dataset
        </Button>
      </form>
    </Card>
  );
}
