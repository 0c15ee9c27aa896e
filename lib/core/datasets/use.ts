/** Turning a dataset into a model input: a fitted law (parameters copied) or the empirical distribution. */
import type { Distribution } from '@/lib/core/engine/schema';
import type { Law, LawParams } from './fit';

export interface DatasetProvenance {
  datasetId: string;
  /** sha256 of the uploaded bytes: a later re-upload is a different dataset with a different hash. */
  hash: string;
  name: string;
  /** 'empirical' or the fitted law. */
  method: 'empirical' | Law;
}

export interface DatasetChoice {
  distribution: Distribution;
  /** For a linear-stack contributor: the stack's own distribution shape. */
  stackDistribution: { type: 'empirical'; data: number[] } | { type: 'normal-fit'; data: number[] } | null;
  source: DatasetProvenance;
}

/** The fitted law as an engine distribution, parameters copied (the gamma fit's shape and scale are the engine's). */
export function lawToDistribution(law: Law, p: LawParams): Distribution {
  switch (law) {
    case 'normal':
      return { type: 'normal', mean: p.mean, sd: p.sd };
    case 'lognormal':
      return { type: 'lognormal', mu: p.mu, sigma: p.sigma };
    case 'weibull':
      return { type: 'weibull', shape: p.shape, scale: p.scale };
    case 'exponential':
      return { type: 'exponential', rate: p.rate };
    case 'uniform':
      return { type: 'uniform', min: p.min, max: p.max };
    case 'gamma':
      return { type: 'gamma', shape: p.shape, scale: p.scale };
  }
}

export function empiricalChoice(ds: { id: string; hash: string; name: string; values: number[] }): DatasetChoice {
  return {
    distribution: { type: 'empirical', data: [...ds.values] },
    stackDistribution: { type: 'empirical', data: [...ds.values] },
    source: { datasetId: ds.id, hash: ds.hash, name: ds.name, method: 'empirical' },
  };
}

export function fittedChoice(ds: { id: string; hash: string; name: string; values: number[] }, law: Law, params: LawParams): DatasetChoice {
  const distribution = lawToDistribution(law, params);
  return {
    distribution,
    // A stack contributor fits its normal from the data itself ('normal-fit'); other laws enter a stack empirically.
    stackDistribution: law === 'normal' ? { type: 'normal-fit', data: [...ds.values] } : null,
    source: { datasetId: ds.id, hash: ds.hash, name: ds.name, method: law },
  };
}
