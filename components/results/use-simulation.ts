'use client';

import { useCallback, useEffect, useLayoutEffect, useMemo, useState, useSyncExternalStore } from 'react';
import type { SampleSelection } from '@/lib/core/engine/simulate';
import type { CheckedModel } from '@/lib/core/engine/checked-model';
import { SimulationController, type RunClient, type SimulationSnapshot } from './simulation-controller';

export type { SimulationSnapshot, SimulationStatus, SimulationError } from './simulation-controller';

export interface UseSimulationOptions {
  /** Wait this long after the last change before running (default 150 ms). */
  debounceMs?: number;
  /** Sample columns to bring back (scatter charts need 'all'; default 'none'). */
  samples?: SampleSelection;
  /** Set false to hold runs (e.g. while a form is invalid). */
  enabled?: boolean;
  /** Engine client factory: createStudioEngine (lib/core/engine/studio-engine) or, for published versions, createEmbedEngine. */
  createClient: () => RunClient;
}

export interface SimulationState extends SimulationSnapshot {
  /** Run the current inputs again now. */
  rerun: () => void;
  /** Stop the run in flight; the previous result stays. */
  cancel: () => void;
}

const SERVER_SNAPSHOT: SimulationSnapshot = { status: 'idle', result: null, stale: false, progress: null, lastRunMs: null, error: null, runs: 0, pending: null };

/**
 * Runs a model with dial values in the engine's web worker and keeps the latest result.
 * Moving a dial reruns after a short debounce with the same seed and sub-streams, cancelling a
 * run in flight; the previous result stays visible (flagged `stale`) until the new one is ready.
 */
export function useSimulation(model: CheckedModel | null, dialValues: Record<string, number> | undefined, options: UseSimulationOptions): SimulationState {
  const { debounceMs = 150, samples = 'none', enabled = true, createClient } = options;
  const [controller] = useState(
    () => new SimulationController({ client: createClient, debounceMs, samples }),
  );
  const snapshot = useSyncExternalStore(controller.subscribe, controller.getSnapshot, () => SERVER_SNAPSHOT);

  // Identity of the inputs: their JSON, computed only when the objects change.
  const key = useMemo(() => (model == null || !enabled ? null : JSON.stringify([model, dialValues ?? {}, samples])), [model, dialValues, enabled, samples]);

  // Before the paint, not after it: the workers start on the change while the page paints.
  useLayoutEffect(() => {
    if (key === null) controller.setInputs(null, undefined, 'none');
    else controller.setInputs(model, dialValues, key, samples);
    // model and dialValues are captured with their key.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [controller, key]);

  useEffect(() => () => controller.dispose(), [controller]);

  const rerun = useCallback(() => controller.runNow(), [controller]);
  const cancel = useCallback(() => controller.cancel(), [controller]);
  return { ...snapshot, rerun, cancel };
}
