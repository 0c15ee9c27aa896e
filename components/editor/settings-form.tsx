'use client';

import { Term } from '@/components/ui/term';
import { MAX_TRIALS, MIN_TRIALS } from '@/lib/core/engine/schema';
import { NumberInput, SelectInput, TextInput, type Choice } from './fields';
import { parseSeedText } from './numbers';
import { Section } from './parts';

const DESIGNS: Choice<'monte-carlo' | 'latin-hypercube'>[] = [
  { value: 'monte-carlo', label: 'Monte Carlo (independent draws)' },
  { value: 'latin-hypercube', label: 'Latin hypercube (stratified)' },
];

const NORMAL_METHODS: Choice<'box-muller' | 'ziggurat'>[] = [
  { value: 'box-muller', label: 'Box–Muller (Box & Muller 1958)' },
  { value: 'ziggurat', label: 'Ziggurat (Marsaglia & Tsang 2000)' },
];

const CORRELATION_METHODS: Choice<'copula' | 'iman-conover'>[] = [
  { value: 'copula', label: 'Gaussian copula (Pearson on normal scores)' },
  { value: 'iman-conover', label: 'Rank correlation (Iman & Conover 1982)' },
];

export function SettingsForm() {
  return (
    <Section
      id="settings"
      title="Simulation settings"
      description={
        <>
          The same model, dial values, <Term term="seed">seed</Term> and number of <Term term="trials">trials</Term> always give identical results, in the browser and in e-mailed
          snapshots.
        </>
      }
    >
      <div className="grid gap-4 @xl:grid-cols-2 @4xl:grid-cols-3">
        <NumberInput path="settings.trials" label="Trials" dense={false} hint={`A whole number from ${MIN_TRIALS.toLocaleString('en-US')} to ${MAX_TRIALS.toLocaleString('en-US')}.`} />
        <TextInput path="settings.seed" label="Seed" dense={false} mono toValue={parseSeedText} hint="A whole number or any text, up to 128 characters." />
        <SelectInput
          path="settings.design"
          label="Sampling design"
          dense={false}
          choices={DESIGNS}
          hint={
            <>
              <Term term="Latin hypercube">Latin hypercube</Term> covers each input’s range evenly with fewer trials than plain <Term term="Monte Carlo">Monte Carlo</Term>.
            </>
          }
        />
        <SelectInput path="settings.normalMethod" label="Normal generator" dense={false} choices={NORMAL_METHODS} hint="How standard normal draws are made; both are exact methods." />
        <SelectInput
          path="settings.correlationMethod"
          label="Correlation method"
          dense={false}
          choices={CORRELATION_METHODS}
          hint="The copula correlates normal scores; rank correlation keeps each input’s draws and reorders them."
        />
      </div>
    </Section>
  );
}
