'use client';

import { useState } from 'react';
import { NumberField } from '@/components/ui/field';
import { Term } from '@/components/ui/term';
import { dataCapability } from '@/lib/core/datasets/summary';

/** Pp/Ppk of the measured data against a stack contributor's tolerance (nominal −minus/+plus). */
export function CapabilityPanel({ values, unit, initialNominal }: { values: number[]; unit: string; initialNominal: number }) {
  const [nominal, setNominal] = useState(String(initialNominal));
  const [plus, setPlus] = useState('');
  const [minus, setMinus] = useState('');
  const n = Number(nominal);
  const p = Number(plus);
  const m = Number(minus);
  const ready = nominal !== '' && plus !== '' && minus !== '' && [n, p, m].every(Number.isFinite) && p >= 0 && m >= 0 && p + m > 0;
  const c = ready ? dataCapability(values, n, p, m) : null;
  return (
    <div className="space-y-3">
      <div className="grid gap-3 sm:grid-cols-3">
        <NumberField label="Contributor nominal" unit={unit} value={nominal} onChange={(e) => setNominal(e.target.value)} step="any" />
        <NumberField label="Plus tolerance" unit={unit} value={plus} onChange={(e) => setPlus(e.target.value)} step="any" min={0} />
        <NumberField label="Minus tolerance" unit={unit} value={minus} onChange={(e) => setMinus(e.target.value)} step="any" min={0} />
      </div>
      {c ? (
        <dl className="grid grid-cols-2 gap-2 font-mono text-sm sm:grid-cols-4" aria-live="polite">
          <div>
            <dt className="font-sans text-ink-600">
              <Term term="Pp">Pp</Term>
            </dt>
            <dd data-testid="data-pp">{c.pp === null ? '—' : c.pp.toFixed(2)}</dd>
          </div>
          <div>
            <dt className="font-sans text-ink-600">
              <Term term="Ppk">Ppk</Term>
            </dt>
            <dd data-testid="data-ppk">{c.ppk === null ? '—' : c.ppk.toFixed(2)}</dd>
          </div>
          <div>
            <dt className="font-sans text-ink-600">Limits</dt>
            <dd>
              {+c.lower.toPrecision(8)} – {+c.upper.toPrecision(8)} {unit}
            </dd>
          </div>
          <div>
            <dt className="font-sans text-ink-600">Measured outside</dt>
            <dd>
              {c.outside} of {values.length}
            </dd>
          </div>
        </dl>
      ) : (
        <p className="text-sm text-ink-600">Enter the contributor’s nominal and tolerances to see Pp and Ppk of the measured parts (overall sample standard deviation).</p>
      )}
    </div>
  );
}
