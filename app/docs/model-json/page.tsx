import type { Metadata } from 'next';
import Link from 'next/link';
import { EXAMPLE_MODELS, DISTRIBUTION_PARAMS, FORMULA_FUNCTIONS, FORMULA_CONSTANTS, MIN_TRIALS, MAX_TRIALS, PERCENTILE_DEFINITION, SCHEMA_ID } from '@/lib/core/engine';
import { Logo } from '@/components/ui/logo';
import { runLimits } from '@/lib/server/simulate/limits';

export const metadata: Metadata = { title: 'Model JSON and the simulate API' };
// The limits shown are the ones this server runs with (set by environment variables at start-up).
export const dynamic = 'force-dynamic';

function RunLimitsTable() {
  const l = runLimits();
  const n = (x: number) => x.toLocaleString('en');
  const rows: [string, string, string, string][] = [
    ['Work budget', `${n(l.maxWork)} draws (trials × sampled columns)`, 'SIMULATE_MAX_WORK', '422 naming model.settings.trials and the most trials the model may have'],
    ['Time limit', `${n(l.timeLimitMs / 1000)} s per run, from the moment it has a thread`, 'SIMULATE_TIME_LIMIT_MS', '503: the run is stopped and its thread freed'],
    ['Wait for a thread', `${n(l.maxWaitMs / 1000)} s`, 'SIMULATE_MAX_WAIT_MS', '503 with Retry-After; the run is not started'],
    ['Runs in progress', `${n(l.concurrentPerKey)} per API key or member, ${n(l.concurrentPerFirm)} per firm`, 'SIMULATE_MAX_CONCURRENT_PER_KEY, _PER_FIRM', '429 with Retry-After'],
    ['Runs started', `${n(l.ratePerKey)} per minute per API key or member, ${n(l.ratePerFirm)} per firm`, 'SIMULATE_RATE_PER_KEY, _PER_FIRM', '429 with Retry-After (seconds to the next minute)'],
    ['Samples returned', `${n(l.maxSampleValues)} values (samples.limit × columns), at most ${n(100_000)} per column`, 'SIMULATE_MAX_SAMPLE_VALUES', '422 naming samples.limit'],
    ['Server queue', `${n(l.maxQueue)} runs waiting for ${n(l.threads)} thread${l.threads === 1 ? '' : 's'}`, 'SIMULATE_MAX_QUEUE, SIMULATE_THREADS', '503 with Retry-After'],
  ];
  return (
    <table className="mt-3 w-full border-collapse text-left text-sm">
      <thead>
        <tr className="border-b border-ink-200">
          <th className="py-1 pr-3 font-medium">Limit</th>
          <th className="py-1 pr-3 font-medium">On this server</th>
          <th className="py-1 pr-3 font-medium">Set by</th>
          <th className="py-1 font-medium">Answer when passed</th>
        </tr>
      </thead>
      <tbody>
        {rows.map(([name, value, envName, answer]) => (
          <tr key={name} className="border-b border-ink-100 align-top">
            <td className="py-1 pr-3">{name}</td>
            <td className="py-1 pr-3">{value}</td>
            <td className="py-1 pr-3"><code className="text-xs">{envName}</code></td>
            <td className="py-1">{answer}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

const TEMPLATE_NOTES: Record<string, { name: string; fields: [string, string][] }> = {
  'linear-stack': {
    name: 'Linear stack (tolerance stack-up)',
    fields: [
      ['unit', 'length unit of every dimension, e.g. "mm"'],
      ['contributors[]', 'id, name, nominal, plusTol, minusTol (both ≥ 0), direction (1 or −1 in the loop), distribution { type: normal (with k: tolerance = ±kσ, default 3) | uniform | triangular | empirical (data) | normal-fit (data) }, meanShift'],
      ['limits', 'lower and/or upper limit on the gap'],
      ['correlation', 'optional { inputs: [contributor ids], matrix: symmetric, unit diagonal, positive semi-definite }: contributors from one machine or batch, drawn through a Gaussian copula; RSS is reported with and without the correlation terms'],
    ],
  },
  'cost-range': {
    name: 'Cost range (range estimate with a risk register)',
    fields: [
      ['currency', 'label of the money unit, e.g. "EUR" or "kEUR"'],
      ['items[]', 'id, name, low ≤ mostLikely ≤ high (low < high), distribution "pert" (default) | "triangular" | "uniform"'],
      ['correlationGroups[]', 'id, name, items (ids), rho: the items are pairwise correlated at rho through a Gaussian copula'],
      ['riskEvents[]', 'id, name, probability in [0, 1], impact { low, mostLikely, high, distribution }'],
      ['baseEstimate, budget, confidence', 'the base the contingency is added to, the budget whose overrun probability is reported, and the P-level (e.g. 0.8)'],
    ],
  },
  formula: {
    name: 'Formula (anything else)',
    fields: [
      ['inputs[]', 'id, name, unit, distribution (any type below)'],
      ['correlation', 'optional { inputs: [ids], matrix: symmetric, unit diagonal, positive semi-definite }'],
      ['outputs[]', 'id, name, unit, formula (may use inputs, earlier outputs and dial variables), optional lower/upper limits'],
    ],
  },
};

const curl = `curl -s -X POST http://localhost:3000/api/v1/simulate \\
  -H "Authorization: Bearer $STOCHOS_API_KEY" \\
  -H "Content-Type: application/json" \\
  -d '{ "model": { ...one of the examples below... },
        "dialValues": { "spacer_length": 24.12 },
        "samples": { "which": "outputs", "limit": 10000 } }'`;

export default function ModelJsonDocs() {
  return (
    <main className="mx-auto max-w-4xl px-5 py-10 text-ink-800">
      <Link href="/" aria-label="Stochos home">
        <Logo />
      </Link>
      <h1 className="mt-8 text-3xl font-semibold text-ink-900">Model JSON and the simulate API</h1>
      <p className="mt-3">
        Every Stochos model is one JSON document tagged <code className="num">&quot;schema&quot;: &quot;{SCHEMA_ID}&quot;</code>. The studio imports and exports it, versions store it,
        and <code className="num">POST /api/v1/simulate</code> runs it on the server with the same engine the browser uses, giving identical figures for the same model, dial values and seed.
      </p>

      <h2 className="mt-8 text-xl font-semibold text-ink-900">Common fields</h2>
      <ul className="mt-2 list-disc space-y-1 pl-6">
        <li><code>template</code>: <code>linear-stack</code>, <code>cost-range</code> or <code>formula</code>; <code>title</code>, optional <code>description</code>.</li>
        <li><code>settings</code>: <code>trials</code> ({MIN_TRIALS.toLocaleString('en')} to {MAX_TRIALS.toLocaleString('en')}), <code>seed</code> (text or whole number), <code>design</code> (<code>monte-carlo</code> or <code>latin-hypercube</code>), <code>normalMethod</code> (<code>box-muller</code> or <code>ziggurat</code>), <code>correlationMethod</code> (<code>copula</code> or <code>iman-conover</code>).</li>
        <li><code>dials[]</code>: what a client may move: id, label, unit, min, max, step, default and a target (an input&apos;s parameter, a limit, the budget, the confidence, the base estimate, a group&apos;s correlation, a matrix correlation, or a free variable used in formulas).</li>
        <li>Percentiles: {PERCENTILE_DEFINITION.name}. {PERCENTILE_DEFINITION.text}</li>
      </ul>

      <h2 className="mt-8 text-xl font-semibold text-ink-900">Distributions and the parameters a dial can move</h2>
      <table className="mt-2 w-full text-sm">
        <thead><tr className="text-left"><th className="py-1">type</th><th>parameters dials can move</th></tr></thead>
        <tbody>
          {Object.entries(DISTRIBUTION_PARAMS).map(([type, params]) => (
            <tr key={type} className="border-t border-ink-200"><td className="num py-1">{type}</td><td className="num">{params.join(', ') || '—'}</td></tr>
          ))}
        </tbody>
      </table>

      <h2 className="mt-8 text-xl font-semibold text-ink-900">Formulas</h2>
      <p className="mt-2">
        Arithmetic <code>+ − * / ^</code>, comparisons, parentheses, names of inputs, outputs and dial variables, the constants {Object.keys(FORMULA_CONSTANTS).join(', ')} and the functions{' '}
        {Object.keys(FORMULA_FUNCTIONS).join(', ')}. Nothing else is evaluated: formulas are parsed, never run as code. Trials that give NaN or infinity are counted and reported.
      </p>

      {Object.entries(TEMPLATE_NOTES).map(([template, note]) => (
        <section key={template} className="mt-10">
          <h2 className="text-xl font-semibold text-ink-900">{note.name}</h2>
          <dl className="mt-2 space-y-1 text-sm">
            {note.fields.map(([k, v]) => (
              <div key={k} className="grid grid-cols-[12rem_1fr] gap-3"><dt className="num text-ink-900">{k}</dt><dd>{v}</dd></div>
            ))}
          </dl>
          <h3 className="mt-4 font-medium text-ink-900">Complete example (invented scenario)</h3>
          {/* The block scrolls, so it takes keyboard focus (arrow keys scroll it) and is named for screen readers. */}
          <pre tabIndex={0} role="region" aria-label={`${note.name}: complete example model JSON`} className="num mt-2 max-h-[28rem] overflow-auto rounded-md bg-ink-900 p-4 text-xs text-ink-50">{JSON.stringify(EXAMPLE_MODELS[template as keyof typeof EXAMPLE_MODELS], null, 2)}</pre>
        </section>
      ))}

      <h2 className="mt-10 text-xl font-semibold text-ink-900">The simulate API</h2>
      <p className="mt-2">
        Authenticate with a signed-in session or a firm API key (the owner creates and revokes keys in Settings). The answer holds the statistics of every output (mean, standard deviation,
        percentiles with order-statistic intervals, histogram, S-curve points, limits with probabilities and binomial intervals, drivers, convergence verdict) and, when asked, up to 100,000
        samples per column. A bad model gets <code>422</code> with <code>error.fields</code> keyed by the path of every bad field, e.g. <code>model.contributors.1.minusTol</code>; a number too large for a double (such as <code>1e309</code>) is refused like any other bad value. The
        request body may be up to 4 MiB (other endpoints take 1 MiB of JSON); a larger one gets <code>413</code>.
      </p>
      <pre className="num mt-3 overflow-auto rounded-md bg-ink-900 p-4 text-xs text-ink-50">{curl}</pre>

      <h3 className="mt-6 font-medium text-ink-900">Limits of server runs</h3>
      <p className="mt-2">
        Runs happen on a pool of worker threads, never on the thread that answers requests, so one large run does not slow anyone else down. Each run is measured in draws:
        <code> settings.trials</code> × the sampled columns (one per contributor of a stack, per line item of a cost range plus two per risk event, per input of a formula model). A
        model over the budget is refused before it runs. The counts of runs are kept in the database, so they hold across every server instance. Every refusal is a JSON error
        <code> {'{ error: { code, message, fields?, retryAfter? } }'}</code> whose message says what to change; <code>GET /api/v1/simulate</code> returns the limits in force and your
        firm&apos;s runs in progress.
      </p>
      <RunLimitsTable />
    </main>
  );
}
