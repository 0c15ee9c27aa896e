'use client';

import { EXAMPLE_MODELS } from '@/lib/engine/examples';
import type { Template } from '@/lib/engine/schema';
import { ResultsPreview } from '@/components/results/results-preview';

const NAMES: Record<Template, string> = { 'linear-stack': 'Linear stack', 'cost-range': 'Cost range', formula: 'Formula' };
const SHORT: Record<string, Template> = { stack: 'linear-stack', cost: 'cost-range', formula: 'formula' };

/** Every template's results for the engine's example models (for screenshots and visual checks). */
export function ChartGallery({ only, view }: { only?: string; view?: string }) {
  const templates = (only && SHORT[only] ? [SHORT[only]] : (Object.keys(EXAMPLE_MODELS) as Template[]));
  return (
    <main id="content" className="mx-auto max-w-6xl space-y-10 px-3 py-6 sm:px-6">
      <header>
        <p className="text-xs font-semibold tracking-wide text-accent-700 uppercase">Development</p>
        <h1 className="text-xl font-semibold text-ink-900">Chart gallery</h1>
        <p className="text-sm text-ink-600">The engine’s example models, run in this browser’s worker. Add ?only=stack|cost|formula to show one.</p>
      </header>
      {templates.map((t) => (
        <section key={t} aria-labelledby={`g-${t}`} className="space-y-3">
          <h2 id={`g-${t}`} className="text-lg font-semibold text-ink-900">
            {NAMES[t]}: {EXAMPLE_MODELS[t].title}
          </h2>
          {view === 'widget' ? null : <ResultsPreview model={EXAMPLE_MODELS[t]} />}
        </section>
      ))}
    </main>
  );
}
