'use client';

import { useId, useRef, useState } from 'react';
import { Button } from '@/components/ui/button';
import { FieldError } from '@/components/ui/field';
import type { CheckedModel, Template } from '@/lib/core/engine/schema';
import type { ModelDraft } from './form-values';
import { exportModelJson, importModelFile, modelFileName, MODEL_FILE_SUFFIX, type ImportIssue } from '@/lib/core/models/json-io';
import { TEMPLATE_LABELS } from '@/lib/core/models/templates';
import { readablePath } from './error-paths';

interface ImportExportProps {
  /** The model as it stands (the draft when it is not valid). */
  getModel: () => CheckedModel | ModelDraft;
  valid: boolean;
  template: Template;
  readOnly: boolean;
  /** Called only with a file that is valid as a whole and of the same template. */
  onImport: (model: CheckedModel) => void;
}

/** Export downloads `<title>.stochos.json`; import replaces the working model only when the whole file is valid. */
export function ImportExport({ getModel, valid, template, readOnly, onImport }: ImportExportProps) {
  const fileRef = useRef<HTMLInputElement>(null);
  const [problems, setProblems] = useState<{ file: string; issues: ImportIssue[] } | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const base = useId().replace(/[^a-zA-Z0-9_-]/g, '');
  const problemsId = `${base}-import-problems`;

  const doExport = () => {
    const model = getModel();
    const text = exportModelJson(model);
    const url = URL.createObjectURL(new Blob([text], { type: 'application/json' }));
    const a = document.createElement('a');
    a.href = url;
    a.download = modelFileName(typeof model.title === 'string' ? model.title : '');
    document.body.appendChild(a);
    a.click();
    a.remove();
    setTimeout(() => URL.revokeObjectURL(url), 1000);
    setDone(`Exported ${a.download}.`);
  };

  const doImport = async (file: File) => {
    setBusy(true);
    setDone(null);
    try {
      const result = await importModelFile(file);
      if (!result.ok) {
        setProblems({ file: file.name, issues: result.errors });
        return;
      }
      if (result.model.template !== template) {
        setProblems({
          file: file.name,
          issues: [
            {
              path: 'template',
              message: `This file holds a ${TEMPLATE_LABELS[result.model.template]} model; this model is a ${TEMPLATE_LABELS[template]}. Create a new ${TEMPLATE_LABELS[result.model.template]} model to import it.`,
            },
          ],
        });
        return;
      }
      setProblems(null);
      onImport(result.model);
      setDone(`Imported ${file.name}: the model now holds its contents.`);
    } finally {
      setBusy(false);
      if (fileRef.current) fileRef.current.value = '';
    }
  };

  return (
    <div>
      <div className="flex flex-wrap items-center gap-2">
        <Button size="sm" variant="secondary" onClick={doExport} title={`Download the model as ${MODEL_FILE_SUFFIX}`}>
          Export JSON
        </Button>
        {readOnly ? null : (
          <>
            <Button size="sm" variant="secondary" pending={busy} pendingLabel="Reading…" onClick={() => fileRef.current?.click()} aria-describedby={problems ? problemsId : undefined}>
              Import JSON…
            </Button>
            <input
              ref={fileRef}
              type="file"
              accept=".json,application/json"
              className="hidden"
              tabIndex={-1}
              aria-hidden="true"
              onChange={(e) => {
                const f = e.target.files?.[0];
                if (f) void doImport(f);
              }}
            />
          </>
        )}
      </div>
      {!valid ? <p className="mt-1 text-xs text-ink-600">The draft has problems; an exported file will not import until they are fixed.</p> : null}
      <p role="status" className="mt-1 text-xs text-ink-700">
        {done}
      </p>
      {problems ? (
        <div id={problemsId} role="alert" className="mt-2 max-w-2xl rounded-md border border-danger-600/30 border-l-4 border-l-danger-700 bg-danger-50 px-3 py-2.5">
          <p className="text-sm font-medium text-ink-900">
            {problems.file} was not imported; the model is unchanged. {problems.issues.length === 1 ? 'One problem:' : `${problems.issues.length} problems:`}
          </p>
          <ul className="mt-1 max-h-60 overflow-y-auto">
            {problems.issues.slice(0, 100).map((p, k) => (
              <li key={k}>
                <FieldError>
                  {p.path !== '_' ? <strong className="font-semibold">{readablePath(p.path)}</strong> : null}
                  {p.path !== '_' ? ' ' : null}
                  {p.line !== undefined && p.path !== '_' ? <span className="num text-xs text-ink-700">(line {p.line}, column {p.column}) </span> : null}
                  {p.path !== '_' ? '— ' : null}
                  {p.message}
                </FieldError>
              </li>
            ))}
          </ul>
          <button type="button" className="mt-1 text-sm text-ink-700 underline" onClick={() => setProblems(null)}>
            Dismiss
          </button>
        </div>
      ) : null}
    </div>
  );
}
