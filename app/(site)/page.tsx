import type { Metadata } from 'next';
import Link from 'next/link';
import { Logo } from '@/components/ui/logo';
import { LinkButton } from '@/components/ui/button';
import { Term } from '@/components/ui/term';
import { normalCdf } from '@/lib/core/engine/special';

export const metadata: Metadata = {
  title: { absolute: 'Stochos: interactive risk models for engineering consultancies' },
};

// ---- Illustration geometry (drawn on the server; invented figures, labelled as such) -------------------------------

// Gap of a tolerance stack, normal with μ = 0.412 mm, σ = 0.110 mm, limits 0.10 and 0.70 mm.
// ppm, Pp and Ppk below follow from those values (normal tails), they are not a simulation.
const GAP = { mu: 0.412, sd: 0.11, lsl: 0.1, usl: 0.7, lo: 0.02, hi: 0.8 };
const SPREAD = { w: 320, h: 132, pad: 10, base: 112 };

function normalPdf(x: number, mu: number, sd: number) {
  const z = (x - mu) / sd;
  return Math.exp(-0.5 * z * z);
}

function spreadBars() {
  const n = 26;
  const width = (GAP.hi - GAP.lo) / n;
  const sx = (x: number) => SPREAD.pad + ((x - GAP.lo) / (GAP.hi - GAP.lo)) * (SPREAD.w - 2 * SPREAD.pad);
  return {
    sx,
    bars: Array.from({ length: n }, (_, i) => {
      const a = GAP.lo + i * width;
      const mid = a + width / 2;
      const hgt = normalPdf(mid, GAP.mu, GAP.sd) * 92;
      return { x: sx(a) + 0.8, w: sx(a + width) - sx(a) - 1.6, y: SPREAD.base - hgt, h: hgt, out: mid < GAP.lsl || mid > GAP.usl };
    }),
  };
}

// Cost: lognormal total with median 12.3 M, σ(ln) = 0.09; P10/P50/P80/P90 = 10.96/12.30/13.27/13.80 M.
const COST = { median: 12.3, s: 0.09, lo: 10.2, hi: 14.6 };
const CURVE = { w: 320, h: 132, padX: 10, top: 12, base: 112 };

function sCurve() {
  const sx = (v: number) => CURVE.padX + ((v - COST.lo) / (COST.hi - COST.lo)) * (CURVE.w - 2 * CURVE.padX);
  const sy = (p: number) => CURVE.base - p * (CURVE.base - CURVE.top);
  const pts: string[] = [];
  for (let i = 0; i <= 80; i++) {
    const v = COST.lo + ((COST.hi - COST.lo) * i) / 80;
    pts.push(`${sx(v).toFixed(1)},${sy(normalCdf(Math.log(v / COST.median) / COST.s)).toFixed(1)}`);
  }
  return { sx, sy, path: `M${pts.join('L')}` };
}

function SpreadIllustration() {
  const { sx, bars } = spreadBars();
  return (
    <svg viewBox={`0 0 ${SPREAD.w} ${SPREAD.h}`} className="h-auto w-full" role="img" aria-labelledby="spread-title spread-desc">
      <title id="spread-title">Spread of the assembly gap (illustration)</title>
      <desc id="spread-desc">
        A histogram of the gap between 0.02 and 0.80 mm, centred near 0.41 mm, with the lower limit at 0.10 mm and the upper limit at 0.70 mm. The bars beyond the limits are hatched.
      </desc>
      <defs>
        <pattern id="hatch-out" width="4" height="4" patternUnits="userSpaceOnUse" patternTransform="rotate(45)">
          <rect width="4" height="4" fill="#fff7ed" />
          <path d="M0 0v4" stroke="#b45309" strokeWidth="1.6" />
        </pattern>
      </defs>
      {/* Out-of-specification zones: pattern and colour, never colour alone. */}
      <rect x={SPREAD.pad} y="14" width={sx(GAP.lsl) - SPREAD.pad} height={SPREAD.base - 14} fill="url(#hatch-out)" opacity="0.55" />
      <rect x={sx(GAP.usl)} y="14" width={SPREAD.w - SPREAD.pad - sx(GAP.usl)} height={SPREAD.base - 14} fill="url(#hatch-out)" opacity="0.55" />
      {bars.map((b) => (
        <rect key={b.x} x={b.x} y={b.y} width={b.w} height={b.h} fill={b.out ? '#b45309' : '#3ba597'} />
      ))}
      <path d={`M${SPREAD.pad} ${SPREAD.base}H${SPREAD.w - SPREAD.pad}`} stroke="#7b8b97" />
      {[
        { x: GAP.lsl, label: 'LSL 0.10' },
        { x: GAP.usl, label: 'USL 0.70' },
      ].map((l) => (
        <g key={l.label}>
          <path d={`M${sx(l.x)} 14V${SPREAD.base}`} stroke="#92400e" strokeWidth="1.2" strokeDasharray="4 3" />
          <text x={sx(l.x)} y="10" textAnchor="middle" className="fill-warn-700 font-mono text-[8px]">
            {l.label}
          </text>
        </g>
      ))}
      {[0.1, 0.3, 0.5, 0.7].map((t) => (
        <text key={t} x={sx(t)} y={SPREAD.base + 12} textAnchor="middle" className="fill-ink-600 font-mono text-[8px]">
          {t.toFixed(1)}
        </text>
      ))}
    </svg>
  );
}

function CostIllustration() {
  const { sx, sy, path } = sCurve();
  const marks = [
    { p: 0.5, v: 12.3, label: 'P50' },
    { p: 0.8, v: 13.268, label: 'P80' },
  ];
  return (
    <svg viewBox={`0 0 ${CURVE.w} ${CURVE.h}`} className="h-auto w-full" role="img" aria-labelledby="cost-title cost-desc">
      <title id="cost-title">Cumulative cost curve (illustration)</title>
      <desc id="cost-desc">
        An S-curve of total cost from 10.2 to 14.6 million euros. P50 is 12.30 million and P80 is 13.27 million. The sum of most-likely values, 11.6 million, sits at about P26. The budget of 13.0
        million is exceeded with a probability of about 27 percent.
      </desc>
      <path d={`M${CURVE.padX} ${CURVE.base}H${CURVE.w - CURVE.padX}`} stroke="#7b8b97" />
      <path d={`M${sx(13)} ${CURVE.top}V${CURVE.base}`} stroke="#92400e" strokeWidth="1.2" strokeDasharray="4 3" />
      <text x={sx(13) + 3} y={CURVE.top + 8} className="fill-warn-700 font-mono text-[8px]">
        budget 13.0
      </text>
      <path d={path} fill="none" stroke="#14574f" strokeWidth="2" />
      {marks.map((m) => (
        <g key={m.label}>
          <path d={`M${CURVE.padX} ${sy(m.p)}H${sx(m.v)}V${CURVE.base}`} fill="none" stroke="#445461" strokeWidth="0.8" strokeDasharray="2 2" />
          <circle cx={sx(m.v)} cy={sy(m.p)} r="2.6" fill="#fff" stroke="#14574f" strokeWidth="1.4" />
          <text x={CURVE.padX + 2} y={sy(m.p) - 3} className="fill-ink-800 font-mono text-[8px]">
            {m.label} {m.v.toFixed(2)}
          </text>
        </g>
      ))}
      <g>
        <path d={`M${sx(11.6)} ${sy(0.2575) - 4}v8`} stroke="#445461" strokeWidth="1.2" />
        <text x={sx(11.6) - 4} y={sy(0.2575) - 6} textAnchor="end" className="fill-ink-700 font-mono text-[8px]">
          Σ most likely
        </text>
      </g>
      {[11, 12, 13, 14].map((t) => (
        <text key={t} x={sx(t)} y={CURVE.base + 12} textAnchor="middle" className="fill-ink-600 font-mono text-[8px]">
          {t}
        </text>
      ))}
    </svg>
  );
}

/** A one-dimensional stack: the housing length (+A) less three parts (−B, −C, −D) leaves the gap. */
function StackIllustration() {
  const parts = [
    { x0: 24, x1: 112, label: '−B', fill: '#d2d9de' },
    { x0: 112, x1: 190, label: '−C', fill: '#e8ecef' },
    { x0: 190, x1: 262, label: '−D', fill: '#d2d9de' },
  ];
  const arrow = (x0: number, x1: number, y: number, key: string, label: string, tone = '#445461') => (
    <g key={key}>
      <path d={`M${x0} ${y - 4}v8M${x1} ${y - 4}v8M${x0 + 1} ${y}H${x1 - 1}`} stroke={tone} strokeWidth="1" />
      <path d={`M${x0 + 1} ${y}l4 -2.2v4.4zM${x1 - 1} ${y}l-4 -2.2v4.4z`} fill={tone} />
      <text x={(x0 + x1) / 2} y={y - 5} textAnchor="middle" className="font-mono text-[8px]" fill={tone}>
        {label}
      </text>
    </g>
  );
  return (
    <svg viewBox="0 0 320 122" className="h-auto w-full" role="img" aria-labelledby="stack-title stack-desc">
      <title id="stack-title">A linear tolerance stack (illustration)</title>
      <desc id="stack-desc">A housing of length A holds three parts B, C and D in a row; the gap left at the end is A minus B, C and D.</desc>
      <rect x="14" y="22" width="10" height="46" fill="#7b8b97" />
      <rect x="296" y="22" width="10" height="46" fill="#7b8b97" />
      <path d="M14 68H306" stroke="#7b8b97" strokeWidth="2" />
      {parts.map((p) => (
        <g key={p.label}>
          <rect x={p.x0 + 0.5} y="32" width={p.x1 - p.x0 - 1} height="34" rx="1.5" fill={p.fill} stroke="#445461" strokeWidth="1" />
        </g>
      ))}
      <rect x="262.5" y="32" width="33" height="34" fill="#eef8f6" stroke="#14574f" strokeWidth="1.2" strokeDasharray="3 2" />
      <text x="279" y="53" textAnchor="middle" className="font-mono text-[8px]" fill="#14574f">
        gap
      </text>
      {parts.map((p) => arrow(p.x0, p.x1, 88, p.label, p.label))}
      {arrow(24, 296, 110, 'A', '+A')}
    </svg>
  );
}

function Figure({ label, value, unit, note }: { label: React.ReactNode; value: string; unit?: string; note?: string }) {
  return (
    <div className="min-w-0">
      <dt className="text-xs font-medium text-ink-600">{label}</dt>
      <dd className="num mt-0.5 text-lg leading-tight font-medium text-ink-900">
        {value}
        {unit ? <span className="ml-1 text-xs text-ink-600">{unit}</span> : null}
      </dd>
      {note ? <dd className="text-[0.6875rem] text-ink-600">{note}</dd> : null}
    </div>
  );
}

/** A still picture of a published widget: headline figures first, then the chart, then a dial. */
function WidgetPicture() {
  return (
    <figure className="relative">
      <div className="rounded-xl border border-ink-200 bg-white shadow-[0_1px_2px_rgb(20_28_34/0.06),0_18px_40px_-18px_rgb(20_28_34/0.35)]">
        <div className="flex items-center justify-between gap-3 border-b border-ink-100 px-4 py-2.5">
          <p className="truncate text-sm font-semibold text-ink-900">Housing flange gap</p>
          <span className="inline-flex flex-none items-center gap-1.5 rounded-full bg-accent-50 px-2 py-0.5 text-[0.6875rem] font-medium text-accent-800 ring-1 ring-accent-200 ring-inset">
            <svg aria-hidden="true" viewBox="0 0 10 10" className="h-2.5 w-2.5">
              <path d="m2 5.2 2 2 4-4.4" fill="none" stroke="currentColor" strokeWidth="1.6" strokeLinecap="round" strokeLinejoin="round" />
            </svg>
            Checked v7
          </span>
        </div>
        <dl className="grid grid-cols-3 gap-3 px-4 pt-3">
          <Figure label="Out of spec" value="6 700" unit="ppm" />
          <Figure label={<abbr title="Process performance index including centring">Ppk</abbr>} value="0.87" note="target ≥ 1.33" />
          <Figure label="Mean gap" value="0.412" unit="mm" />
        </dl>
        <div className="px-3 pt-2">
          <SpreadIllustration />
        </div>
        <div className="border-t border-ink-100 px-4 py-3">
          <div className="flex items-baseline justify-between text-xs">
            <span className="font-medium text-ink-800">Bracket thickness tolerance</span>
            <span className="num text-ink-900">± 0.15 mm</span>
          </div>
          <div aria-hidden="true" className="relative mt-2 h-1.5 rounded-full bg-ink-100">
            <div className="absolute inset-y-0 left-0 w-[62%] rounded-full bg-accent-600" />
            <div className="absolute top-1/2 left-[62%] h-4 w-4 -translate-x-1/2 -translate-y-1/2 rounded-full border-2 border-accent-700 bg-white shadow" />
          </div>
        </div>
      </div>
      <figcaption className="mt-2 text-xs text-ink-600">Illustration with invented figures: a published widget as a client’s engineer sees it.</figcaption>
    </figure>
  );
}

const STEPS = [
  {
    n: '01',
    title: 'Author',
    body: 'A consultant builds the model once: inputs with their distributions, correlations, risk events and the formula, from a template or from scratch. They choose which dials a client may move, and within what range.',
  },
  {
    n: '02',
    title: 'Check',
    body: 'A second engineer reviews the version beside the previous one and signs it off with a note. Versions never change after saving, so the record shows exactly what was checked.',
  },
  {
    n: '03',
    title: 'Publish',
    body: 'The checked version becomes a widget in the client’s own portal or report page, framed only by the addresses you allow and visible only to that client. One snippet for their web team.',
  },
  {
    n: '04',
    title: 'Explore',
    body: 'Client stakeholders move the dials and the results recompute in their browser: nothing is sent back. Anyone can have a PDF snapshot of exactly what they see e-mailed for the project file.',
  },
];

export default function LandingPage() {
  return (
    <div className="min-h-dvh bg-white">
      <a href="#content" className="sr-only z-50 rounded-md bg-white px-3 py-2 text-sm font-medium text-accent-800 shadow focus:not-sr-only focus:fixed focus:top-2 focus:left-2">
        Skip to content
      </a>
      <header className="border-b border-ink-100">
        <div className="mx-auto flex h-16 max-w-6xl items-center gap-4 px-4 sm:px-6">
          <Link href="/" className="rounded-md" aria-label="Stochos home">
            <Logo />
          </Link>
          <nav aria-label="Page sections" className="ml-6 hidden gap-5 text-sm text-ink-700 md:flex">
            <a href="#how" className="hover:text-ink-900">
              How it works
            </a>
            <a href="#models" className="hover:text-ink-900">
              Models
            </a>
            <a href="#pricing" className="hover:text-ink-900">
              Pricing
            </a>
            <a href="#cautions" className="hover:text-ink-900">
              Cautions
            </a>
          </nav>
          <div className="ml-auto flex items-center gap-2">
            <Link href="/sign-in" className="rounded-md px-2.5 py-2 text-sm font-medium text-ink-800 hover:bg-ink-100">
              Sign in
            </Link>
            <span className="hidden sm:block">
              <LinkButton href="/sign-up" size="sm">
                Create your firm’s account
              </LinkButton>
            </span>
          </div>
        </div>
      </header>

      <main id="content">
        <section className="st-grid border-b border-ink-100 bg-ink-50">
          <div className="mx-auto grid max-w-6xl gap-10 px-4 py-12 sm:px-6 md:py-16 lg:grid-cols-[minmax(0,1.1fr)_minmax(0,0.9fr)] lg:items-center lg:gap-14">
            <div>
              <p className="text-sm font-semibold tracking-wide text-accent-700 uppercase">For engineering consultancies</p>
              <h1 className="mt-3 text-[2rem] leading-[1.1] font-semibold tracking-tight text-ink-900 sm:text-[2.75rem]">
                Risk models your clients can move, checked before they see them.
              </h1>
              <p className="mt-5 max-w-xl text-[1.0625rem] leading-relaxed text-ink-700">
                Author a parametric risk model once, a tolerance stack-up or a cost range. A second engineer checks and signs off the version. Publish it as an interactive widget in your
                client’s portal, where their people move the dials and watch the distribution, the percentiles and the probability of non-conformance or overrun recompute in their own
                browser.
              </p>
              <div className="mt-7 flex flex-wrap gap-3">
                <LinkButton href="/sign-up">Create your firm’s account</LinkButton>
                <LinkButton href="/sign-in" variant="secondary">
                  Sign in
                </LinkButton>
              </div>
              <p className="mt-4 text-sm text-ink-600">Priced per consultant seat. Client viewers are free and need no account.</p>
            </div>
            <WidgetPicture />
          </div>
        </section>

        <section id="how" aria-labelledby="how-heading" className="scroll-mt-4 border-b border-ink-100">
          <div className="mx-auto max-w-6xl px-4 py-14 sm:px-6">
            <h2 id="how-heading" className="text-2xl font-semibold tracking-tight text-ink-900">
              From a consultant’s workbook to the client’s screen
            </h2>
            <p className="mt-2 max-w-2xl text-ink-700">
              Today every “what if we tighten this tolerance, pick the other supplier, accept that risk?” costs another round of static charts in a PDF. With Stochos the client asks the model
              directly, within the limits you set.
            </p>
            <ol className="mt-8 grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
              {STEPS.map((s) => (
                <li key={s.n} className="rounded-lg border border-ink-200 bg-white p-5">
                  <p className="num text-sm font-medium text-accent-700">{s.n}</p>
                  <h3 className="mt-1 text-base font-semibold text-ink-900">{s.title}</h3>
                  <p className="mt-1.5 text-sm leading-relaxed text-ink-700">{s.body}</p>
                </li>
              ))}
            </ol>
          </div>
        </section>

        <section id="models" aria-labelledby="models-heading" className="scroll-mt-4 border-b border-ink-100 bg-ink-50">
          <div className="mx-auto max-w-6xl px-4 py-14 sm:px-6">
            <h2 id="models-heading" className="text-2xl font-semibold tracking-tight text-ink-900">
              The questions your clients actually ask
            </h2>
            <div className="mt-8 grid gap-5 lg:grid-cols-2">
              <article className="rounded-lg border border-ink-200 bg-white p-5">
                <h3 className="text-base font-semibold text-ink-900">Will the parts still assemble?</h3>
                <p className="mt-1.5 text-sm leading-relaxed text-ink-700">
                  A tolerance stack-up with each contributor’s nominal, tolerances and direction around the loop. <Term term="worst case">Worst case</Term>, <Term term="RSS" /> and{' '}
                  <Term term="Monte Carlo" /> side by side; the fraction of assemblies out of specification in <Term term="ppm" />; <Term term="Pp/Ppk" /> of the gap; and the contributors
                  ranked by their share of the variation.
                </p>
                <div className="mt-4 rounded-md border border-ink-100 bg-ink-50 px-2 pt-2 pb-1">
                  <StackIllustration />
                </div>
                <p className="mt-2 text-xs text-ink-600">
                  Gap = A − B − C − D. Each dimension carries its own tolerance and distribution; a dial can let the client try a tighter tolerance or another supplier’s process.
                </p>
              </article>
              <article className="rounded-lg border border-ink-200 bg-white p-5">
                <h3 className="text-base font-semibold text-ink-900">How likely is the budget to hold?</h3>
                <p className="mt-1.5 text-sm leading-relaxed text-ink-700">
                  Line items as <Term term="three-point estimate">three-point estimates</Term>, correlated where they move together, plus a risk register of events with their probability and
                  impact. The <Term term="S-curve" /> with <Term term="P50" />, <Term term="P80" /> and <Term term="P90" />, the <Term term="contingency" /> needed for a chosen confidence, and
                  the chance of exceeding the budget.
                </p>
                <div className="mt-4 rounded-md border border-ink-100 bg-ink-50 px-2 pt-2">
                  <CostIllustration />
                </div>
                <p className="mt-2 text-xs text-ink-600">
                  Illustration with invented figures (million €): P50 <span className="num">12.30</span>, P80 <span className="num">13.27</span>; the sum of most-likely values,{' '}
                  <span className="num">11.6</span>, sits near P26, which is why a single-point estimate so often overruns.
                </p>
              </article>
            </div>
            <p className="mt-5 text-sm text-ink-700">
              Anything else your engineers model goes into a <strong className="font-semibold text-ink-900">Formula</strong> model: named uncertain inputs and one or more output formulas. Every
              run is reproducible: the same version, dial values, <Term term="seed" /> and number of <Term term="trials" /> give identical figures, in the browser and in the PDF.
            </p>
          </div>
        </section>

        <section aria-labelledby="viewers-heading" className="border-b border-ink-100">
          <div className="mx-auto grid max-w-6xl gap-8 px-4 py-14 sm:px-6 lg:grid-cols-3">
            <div>
              <h2 id="viewers-heading" className="text-2xl font-semibold tracking-tight text-ink-900">
                Built for the client’s side too
              </h2>
            </div>
            <ul className="grid gap-5 text-sm leading-relaxed text-ink-700 sm:grid-cols-2 lg:col-span-2">
              <li>
                <p className="font-semibold text-ink-900">Computed in their browser</p>
                The sampling runs in the viewer’s own browser; dial values never leave the page unless they ask for a snapshot.
              </li>
              <li>
                <p className="font-semibold text-ink-900">Only where you allow</p>
                Each client has the exact web addresses that may show its widgets and the e-mail domains whose people may receive snapshots. Access can be withdrawn at once.
              </li>
              <li>
                <p className="font-semibold text-ink-900">A PDF for the project file</p>
                A snapshot of exactly what the viewer sees, with the version, its sign-off, the dial values, the method and the cautions, sent by e-mail.
              </li>
              <li>
                <p className="font-semibold text-ink-900">Your branding</p>
                Widgets and snapshots carry your firm’s colour and fit a narrow portal column as well as a wide report page.
              </li>
            </ul>
          </div>
        </section>

        <section id="pricing" aria-labelledby="pricing-heading" className="scroll-mt-4 border-b border-ink-100 bg-ink-50">
          <div className="mx-auto max-w-6xl px-4 py-14 sm:px-6">
            <h2 id="pricing-heading" className="text-2xl font-semibold tracking-tight text-ink-900">
              Pay for the engineers, not the audience
            </h2>
            <dl className="mt-6 grid gap-4 sm:grid-cols-3">
              <div className="rounded-lg border border-ink-200 bg-white p-5">
                <dt className="text-sm font-semibold text-ink-900">Authors and checkers</dt>
                <dd className="mt-1 text-sm text-ink-700">One seat each, billed monthly per seat. Add or remove seats as projects come and go.</dd>
              </div>
              <div className="rounded-lg border border-ink-200 bg-white p-5">
                <dt className="text-sm font-semibold text-ink-900">Account owner</dt>
                <dd className="mt-1 text-sm text-ink-700">Runs the team, billing and firm settings. Takes no seat.</dd>
              </div>
              <div className="rounded-lg border border-ink-200 bg-white p-5">
                <dt className="text-sm font-semibold text-ink-900">Client viewers</dt>
                <dd className="mt-1 text-sm text-ink-700">Free and unlimited. They open widgets in their own portal and need no Stochos account.</dd>
              </div>
            </dl>
          </div>
        </section>

        <section id="cautions" aria-labelledby="cautions-heading" className="scroll-mt-4">
          <div className="mx-auto max-w-6xl px-4 py-14 sm:px-6">
            <div className="rounded-lg border border-l-4 border-warn-600/30 border-l-warn-600 bg-warn-50 px-5 py-5 sm:px-6">
              <h2 id="cautions-heading" className="flex items-center gap-2 text-lg font-semibold text-ink-900">
                <svg aria-hidden="true" viewBox="0 0 16 16" className="h-4 w-4 text-warn-700">
                  <path d="M8 1.5 15 14H1L8 1.5Z" fill="currentColor" />
                  <path d="M8 6v3.5M8 11.3v.2" stroke="#fff" strokeWidth="1.6" strokeLinecap="round" />
                </svg>
                What the numbers are, and what they are not
              </h2>
              <div className="mt-3 grid gap-4 text-sm leading-relaxed text-ink-800 md:grid-cols-3">
                <p>
                  Results are estimates that support, and never replace, engineering judgement, the applicable standards and licensed sign-off. They depend on the distributions and
                  correlations chosen; low trial counts are flagged.
                </p>
                <p>
                  <strong className="font-semibold">Tolerances.</strong> A model covers only the dimensions entered. Confirm against the drawing’s geometric tolerancing (ASME Y14.5 or
                  ISO GPS), real process capability data and a qualified engineer’s review before release, above all for safety-critical parts.
                </p>
                <p>
                  <strong className="font-semibold">Costs.</strong> Decision support under stated assumptions, following the practice of AACE International recommended practices for
                  contingency. Not a guarantee, and not financial advice.
                </p>
              </div>
            </div>
            <div className="mt-10 flex flex-col items-start gap-4 sm:flex-row sm:items-center sm:justify-between">
              <p className="text-lg font-medium text-ink-900">Ready to put your first model in front of a client?</p>
              <div className="flex flex-wrap gap-3">
                <LinkButton href="/sign-up">Create your firm’s account</LinkButton>
                <LinkButton href="/sign-in" variant="secondary">
                  Sign in
                </LinkButton>
              </div>
            </div>
          </div>
        </section>
      </main>

      <footer className="st-dark border-t border-ink-100 bg-ink-900 text-ink-300">
        <div className="mx-auto flex max-w-6xl flex-col gap-3 px-4 py-8 text-sm sm:flex-row sm:items-center sm:justify-between sm:px-6">
          <Logo tone="light" />
          <p>Parametric risk models, checked and published for your clients.</p>
        </div>
      </footer>
    </div>
  );
}
