// The results of a run as plain tables: the CSV export, and reusable by the PDF snapshot.
// Values stay numbers (full precision); units go in their own column.
import type { OutputSummary, RunResult } from '@/lib/core/engine';
import { PERCENTILE_DEFINITION } from '@/lib/core/engine/stats';
import type { CsvTable, CsvValue } from './csv';

const pct = (p: number) => `P${+(p * 100).toFixed(2)}`;

function runTable(r: RunResult): CsvTable {
  const rows: CsvValue[][] = [
    ['Model', r.title],
    ['Template', r.template],
    ['Trials', r.run.trials],
    ['Seed', String(r.run.seed)],
    ['Design', r.run.design],
    ['Normal generator', r.run.normalMethod],
    ['Correlation method', r.run.correlationMethod],
    ['Random numbers', r.run.rng],
    ['Percentile definition', PERCENTILE_DEFINITION.name],
    ['Engine', r.engine],
  ];
  for (const [id, v] of Object.entries(r.run.dialValues)) rows.push([`Dial ${id}`, v]);
  return { title: 'Run', columns: ['Setting', 'Value'], rows };
}

function summaryTable(o: OutputSummary): CsvTable {
  const u = o.unit;
  const rows: CsvValue[][] = [
    ['Trials', o.trials, ''],
    ['Valid trials', o.valid, ''],
    ['Invalid trials (NaN or infinite)', o.invalid.total, ''],
    ['Mean', o.mean, u],
    ['Standard deviation (n − 1)', o.sd, u],
    ['Standard error of the mean', o.sem, u],
    ['Minimum', o.min, u],
    ['Maximum', o.max, u],
  ];
  const l = o.limits;
  if (l) {
    if (l.lower !== null) rows.push(['Lower limit', l.lower, u]);
    if (l.upper !== null) rows.push(['Upper limit', l.upper, u]);
    if (l.below) rows.push(['Share below the lower limit', l.below.p, ''], ['  95 % interval, low', l.below.ci.low, ''], ['  95 % interval, high', l.below.ci.high, '']);
    if (l.above) rows.push(['Share above the upper limit', l.above.p, ''], ['  95 % interval, low', l.above.ci.low, ''], ['  95 % interval, high', l.above.ci.high, '']);
    rows.push(['Out of limits, observed', l.ppmObserved, 'ppm'], ['  95 % interval, low', l.ppmObservedCi.low, 'ppm'], ['  95 % interval, high', l.ppmObservedCi.high, 'ppm']);
    if (l.ppmNormal !== null) rows.push(['Out of limits, normal estimate', l.ppmNormal, 'ppm']);
    if (l.pp !== null) rows.push(['Pp (overall variation)', l.pp, '']);
    if (l.ppk !== null) rows.push(['Ppk (overall variation)', l.ppk, '']);
  }
  rows.push(['Convergence', o.convergence.verdict, '']);
  return { title: `${o.label}: summary`, columns: ['Statistic', 'Value', 'Unit'], rows };
}

function percentileTable(o: OutputSummary): CsvTable {
  return {
    title: `${o.label}: percentiles (${PERCENTILE_DEFINITION.name})`,
    columns: ['Percentile', 'Value', '95 % interval, low', '95 % interval, high', 'Unit'],
    rows: o.percentiles.map((p) => [pct(p.p), p.value, p.ci?.low ?? null, p.ci?.high ?? null, o.unit]),
  };
}

function driverTable(o: OutputSummary): CsvTable {
  return {
    title: `${o.label}: drivers (Spearman rank correlation over ${o.drivers.trials} trials)`,
    columns: ['Rank', 'Input id', 'Input', 'Rank correlation', 'Share of variance'],
    rows: o.drivers.items.map((d, i) => [i + 1, d.id, d.label, d.spearman, d.share]),
  };
}

function stackTables(r: RunResult): CsvTable[] {
  const s = r.stack;
  if (!s) return [];
  const a = s.analytic;
  const u = a.unit;
  const gap = r.outputs[0];
  const mc = s.monteCarlo;
  const within = (lo: number | null, hi: number | null) =>
    lo === null || hi === null ? null : (a.limits.lower === null || lo >= a.limits.lower) && (a.limits.upper === null || hi <= a.limits.upper);
  const mcLo = mc.mean !== null && mc.sd !== null ? mc.mean - 3 * mc.sd : null;
  const mcHi = mc.mean !== null && mc.sd !== null ? mc.mean + 3 * mc.sd : null;
  return [
    {
      title: 'Stack-up: worst case, RSS and Monte Carlo',
      columns: ['Method', 'Lowest gap', 'Highest gap', 'Centre', 'Unit', 'Within limits', 'Out of limits (ppm)'],
      rows: [
        ['Worst case', a.worstCase.min, a.worstCase.max, (a.worstCase.min + a.worstCase.max) / 2, u, a.worstCaseWithinLimits, null],
        ['RSS (mean ± root sum of squared half tolerances)', a.rss.min, a.rss.max, a.rss.mean, u, a.rssWithinLimits, null],
        ['Monte Carlo (mean ± 3 s)', mcLo, mcHi, mc.mean, u, within(mcLo, mcHi), mc.ppmObserved],
        ['Monte Carlo (observed minimum and maximum)', gap?.min ?? null, gap?.max ?? null, gap?.percentiles.find((p) => p.p === 0.5)?.value ?? null, u, within(gap?.min ?? null, gap?.max ?? null), mc.ppmObserved],
      ],
    },
    {
      title: 'Stack-up: contributors',
      columns: ['Id', 'Contributor', 'Direction', 'Nominal', 'Plus tolerance', 'Minus tolerance', 'Mean shift', 'Assumption', 'Sigma', 'Share of variance (analytic)', 'Share of variance (Monte Carlo, rank)', 'Rank correlation', 'Unit'],
      rows: s.contributors.map((c) => {
        const ac = a.contributors.find((x) => x.id === c.id);
        return [c.id, c.name, ac ? (ac.direction > 0 ? '+' : '−') : null, ac?.nominal ?? null, ac?.plusTol ?? null, ac?.minusTol ?? null, ac?.meanShift ?? null, ac?.assumption ?? null, c.sigma, c.analyticShare, c.monteCarloShare, c.spearman, u];
      }),
    },
  ];
}

function costTables(r: RunResult): CsvTable[] {
  const c = r.cost;
  if (!c) return [];
  const a = c.analytic;
  const u = a.currency;
  const rows: CsvValue[][] = [
    ['P10', c.p10, u],
    ['P50', c.p50, u],
    ['P80', c.p80, u],
    ['P90', c.p90, u],
    [`Total at the chosen confidence (${pct(c.confidence)})`, c.atConfidence.value, u],
    ['Base estimate', a.baseEstimate, u],
    [`Contingency to ${pct(c.confidence)} over the base estimate`, c.contingency, u],
    ['Contingency as a share of the base estimate', c.contingencyShareOfBase, ''],
    ['Sum of most-likely values', a.sumMostLikely, u],
    ['Share of trials at or below the sum of most-likely values', c.sumMostLikelyRank, ''],
    ['Share of trials at or below the base estimate', c.baseEstimateRank, ''],
    ['Expected total (closed form)', a.expectedTotal, u],
    ['Expected cost of risks (closed form)', a.expectedRisk, u],
  ];
  if (a.budget !== null) rows.push(['Budget', a.budget, u]);
  if (c.exceedBudget) rows.push(['Chance of exceeding the budget', c.exceedBudget.p, ''], ['  95 % interval, low', c.exceedBudget.ci.low, ''], ['  95 % interval, high', c.exceedBudget.ci.high, '']);
  return [
    { title: 'Cost range: figures', columns: ['Figure', 'Value', 'Unit'], rows },
    {
      title: 'Cost range: line items',
      columns: ['Id', 'Item', 'Most likely', 'Mean', 'Standard deviation', 'Unit'],
      rows: a.items.map((i) => [i.id, i.name, i.mostLikely, i.mean, i.sd, u]),
    },
    {
      title: 'Cost range: risk register',
      columns: ['Id', 'Risk', 'Probability', 'Mean impact if it occurs', 'Expected value', 'Standard deviation', 'Unit'],
      rows: a.risks.map((k) => [k.id, k.name, k.probability, k.meanImpact, k.expectedValue, k.sd, u]),
    },
  ];
}

/** Every table of a run, in reading order. */
export function resultTables(r: RunResult): CsvTable[] {
  return [runTable(r), ...stackTables(r), ...costTables(r), ...r.outputs.flatMap((o) => [summaryTable(o), percentileTable(o), driverTable(o)])];
}
