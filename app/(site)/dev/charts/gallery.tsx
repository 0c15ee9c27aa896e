'use client';

import { EXAMPLE_MODELS } from '@/lib/core/engine/examples';
import { validateModel, type CheckedModel, type Template } from '@/lib/core/engine/schema';
import { ResultsPreview } from '@/components/results/results-preview';
import { WidgetView } from '@/components/widget/widget-view';
import { createStudioEngine } from '@/lib/core/engine/studio-engine';
import { defaultHeadline } from '@/lib/core/models/widget-options';

// Invented firms and colours: a dark accent, a light one (darkened for contrast) and a purple.
const BRANDS: Record<Template, { firmName: string; brandColor: string; logoUrl?: string }> = {
  'linear-stack': {
    firmName: 'Orrinvale Engineering',
    brandColor: '#1d3557',
    logoUrl:
      'data:image/svg+xml,' +
      encodeURIComponent('<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 40 40"><rect width="40" height="40" rx="8" fill="#1d3557"/><path d="M10 28 20 10l10 18z" fill="none" stroke="#fff" stroke-width="3"/></svg>'),
  },
  'cost-range': { firmName: 'Hallam & Peake Cost Consultants', brandColor: '#e9c46a' },
  formula: { firmName: 'Tarnwick Process Partners', brandColor: '#6a4c93' },
};

const NAMES: Record<Template, string> = { 'linear-stack': 'Linear stack', 'cost-range': 'Cost range', formula: 'Formula' };
const SHORT: Record<string, Template> = { stack: 'linear-stack', cost: 'cost-range', formula: 'formula' };

/** The example, checked as the studio checks a model before it runs it. */
function checkedExample(t: Template): CheckedModel {
  const r = validateModel(EXAMPLE_MODELS[t]);
  if (!r.ok) throw new Error(`The ${t} example does not validate: ${r.issues[0]?.message}`);
  return r.model;
}

/** Every template's results for the engine's example models (for screenshots and visual checks). */
export function ChartGallery({ only, view }: { only?: string; view?: string }) {
  const templates = (only && SHORT[only] ? [SHORT[only]] : (Object.keys(EXAMPLE_MODELS) as Template[]));
  return (
    <main id="content" className="mx-auto max-w-6xl space-y-10 px-3 py-6 sm:px-6">
      <header>
        <p className="text-xs font-semibold tracking-wide text-accent-700 uppercase">Development</p>
        <h1 className="text-xl font-semibold text-ink-900">Chart gallery</h1>
        <p className="text-sm text-ink-600">The engine’s example models, run in this browser’s worker. Add ?only=stack|cost|formula to show one, and &view=widget for what a client sees.</p>
      </header>
      {templates.map((t) => (
        <section key={t} aria-labelledby={`g-${t}`} className="space-y-3">
          <h2 id={`g-${t}`} className="text-lg font-semibold text-ink-900">
            {NAMES[t]}: {EXAMPLE_MODELS[t].title}
          </h2>
          {view === 'widget' ? (
            <WidgetView
              createEngine={createStudioEngine}
              model={checkedExample(t)}
              widget={{
                title: EXAMPLE_MODELS[t].title,
                panels: ['headline', 'cumulative', 'spread', 'drivers'],
                headline: defaultHeadline(t),
                dialIds: (EXAMPLE_MODELS[t].dials ?? []).map((d) => d.id),
              }}
              branding={BRANDS[t]}
              versionInfo={{ number: 3, signedOffAt: t === 'formula' ? null : '2026-11-24T10:12:00Z' }}
            />
          ) : (
            <ResultsPreview model={checkedExample(t)} />
          )}
        </section>
      ))}
    </main>
  );
}
