'use client';

import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { EXAMPLE_MODELS } from '@/lib/core/engine/examples';
import type { CheckedModel, Template } from '@/lib/core/engine/schema';
import type { ModelDraft } from './form-values';
import { ModelEditor } from './model-editor';

// Development page body: each template's example in the editor, with switches for the states worth looking at.

/** A copy of the example with the faults the editor must catch beside their fields. */
function broken(template: Template): ModelDraft {
  const m: ModelDraft = structuredClone(EXAMPLE_MODELS[template]);
  if (m.template === 'linear-stack') {
    const rows = m.contributors ?? [];
    rows[0].minusTol = -0.05; // tolerance below zero
    rows[1].plusTol = 0;
    rows[1].minusTol = 0; // zero-width band
    m.limits = { lower: 0.4, upper: 0.05 };
  } else if (m.template === 'cost-range') {
    const items = m.items ?? [];
    items[1].mostLikely = 40; // above high: three-point values out of order
    items[2].low = 96;
    items[2].high = 96; // zero width
    (m.riskEvents ?? [])[0].probability = 1.3; // not a probability
  } else {
    (m.outputs ?? [])[1].formula = 'hydraulic_kw / pump_efficency'; // unknown name
    m.correlation = {
      inputs: ['flow', 'head', 'pump_eff'],
      matrix: [
        [1, 0.9, 0.8],
        [0.9, 1, -0.6],
        [0.8, -0.6, 1],
      ],
    };
  }
  return m;
}

const SERVER_422: Record<Template, Record<string, string[]>> = {
  'linear-stack': { 'contributors.2.nominal': ['The server refused this value (example of a 422 message shown beside its field).'] },
  'cost-range': { budget: ['The server refused this value (example of a 422 message shown beside its field).'] },
  formula: { 'inputs.0.name': ['The server refused this value (example of a 422 message shown beside its field).'] },
};

export function EditorDemo({ template }: { template: Template }) {
  const [model, setModel] = useState<CheckedModel | ModelDraft>(EXAMPLE_MODELS[template]);
  const [valid, setValid] = useState<boolean | null>(null);
  const [changes, setChanges] = useState(0);
  const [readOnly, setReadOnly] = useState(false);
  const [errors, setErrors] = useState<Record<string, string[]> | undefined>(undefined);

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-center gap-2 rounded-md border border-dashed border-ink-300 bg-white px-3 py-2 text-sm">
        <span className="font-medium text-ink-800">Demo controls:</span>
        <Button size="sm" variant="secondary" onClick={() => setModel(structuredClone(EXAMPLE_MODELS[template]))}>
          Load the example
        </Button>
        <Button size="sm" variant="secondary" onClick={() => setModel(broken(template))}>
          Load a broken copy
        </Button>
        <Button size="sm" variant="secondary" onClick={() => setErrors(SERVER_422[template])}>
          Show a server 422
        </Button>
        <Button size="sm" variant="secondary" aria-pressed={readOnly} onClick={() => setReadOnly((r) => !r)}>
          {readOnly ? 'Make editable' : 'Make read-only'}
        </Button>
        <span className="ml-auto text-ink-700" data-testid="editor-state">
          {changes} change{changes === 1 ? '' : 's'} reported
          {valid === null ? '' : valid ? ' · last: valid' : ' · last: invalid'}
        </span>
      </div>
      <ModelEditor
        value={model}
        readOnly={readOnly}
        errors={errors}
        onChange={(m, ok) => {
          setModel(m);
          setValid(ok);
          setChanges((c) => c + 1);
        }}
      />
    </div>
  );
}
