'use client';

import { useState } from 'react';
import { useFormContext } from 'react-hook-form';
import { DatasetPicker } from '@/components/datasets/dataset-picker';
import { useEditor } from './editor-context';

/**
 * "Use measured data": opens the firm's dataset library and writes the chosen fitted law or empirical
 * distribution into the field at `path`. The library loads only when asked for.
 */
export function MeasuredDataButton({ path, target }: { path: string; target: 'input' | 'stack' }) {
  const { setValue } = useFormContext();
  const { readOnly } = useEditor();
  const [open, setOpen] = useState(false);
  if (readOnly) return null;
  if (!open) {
    return (
      <button type="button" onClick={() => setOpen(true)} className="mt-1 text-xs font-medium text-accent-700 underline underline-offset-2 hover:text-accent-800">
        Use measured data from the dataset library…
      </button>
    );
  }
  return (
    <div className="mt-2 rounded-md border border-ink-200 bg-ink-50 p-3">
      <DatasetPicker
        target={target}
        onPick={(c) => {
          setValue(path, target === 'stack' ? (c.stackDistribution ?? c.distribution) : c.distribution, { shouldDirty: true, shouldValidate: true });
          setOpen(false);
        }}
      />
      <button type="button" onClick={() => setOpen(false)} className="mt-2 text-xs text-ink-600 underline underline-offset-2">
        Close the library
      </button>
    </div>
  );
}
