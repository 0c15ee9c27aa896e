import { afterEach, describe, expect, it, vi } from 'vitest';
import { SimulationController, type RunClient } from '@/components/results/simulation-controller';
import { ModelValidationError, RunCancelledError } from '@/lib/core/engine/errors';
import type { Progress, RunResult } from '@/lib/core/engine/simulate';
import type { WorkerRunOptions } from '@/lib/core/engine/worker-client';
import type { CheckedModel } from '@/lib/core/engine/checked-model';

/** The controller only hands its model to the client: a token stands in for one (the fake client never reads it). */
const token = (m: number | string) => ({ m }) as unknown as CheckedModel;

/** A fake engine client: each run waits until the test resolves or rejects it. */
class FakeClient implements RunClient {
  calls: Array<{ model: unknown; options: WorkerRunOptions; resolve: (r: RunResult) => void; reject: (e: unknown) => void; cancelled: boolean }> = [];
  terminated = 0;
  run(model: unknown, options: WorkerRunOptions = {}): Promise<RunResult> {
    this.cancel();
    return new Promise((resolve, reject) => {
      this.calls.push({ model, options, resolve, reject, cancelled: false });
    });
  }
  cancel(): void {
    const last = this.calls[this.calls.length - 1];
    if (last && !last.cancelled) {
      last.cancelled = true;
      last.reject(new RunCancelledError());
    }
  }
  terminate(): void {
    this.terminated++;
  }
  get last() {
    return this.calls[this.calls.length - 1];
  }
}

const fakeResult = (tag: string) => ({ title: tag }) as unknown as RunResult;

function setup(debounceMs = 150) {
  vi.useFakeTimers();
  let clock = 0;
  const client = new FakeClient();
  const c = new SimulationController({ client, debounceMs, samples: 'all', now: () => clock });
  const seen: string[] = [];
  c.subscribe(() => seen.push(c.getSnapshot().status));
  return { c, client, seen, tick: (ms: number) => (clock += ms) };
}

afterEach(() => {
  vi.useRealTimers();
});

describe('SimulationController', () => {
  it('runs the first inputs at once, with the sample selection and dial values', async () => {
    const { c, client, tick } = setup();
    c.setInputs(token(1), { d: 2 }, 'k1');
    expect(client.calls).toHaveLength(1);
    expect(client.last.options.samples).toBe('all');
    expect(client.last.options.dialValues).toEqual({ d: 2 });
    expect(c.getSnapshot().status).toBe('running');
    tick(84);
    client.last.resolve(fakeResult('first'));
    await vi.waitFor(() => expect(c.getSnapshot().status).toBe('done'));
    expect(c.getSnapshot().result?.title).toBe('first');
    expect(c.getSnapshot().lastRunMs).toBe(84);
    expect(c.getSnapshot().runs).toBe(1);
  });

  it('reports progress of the run in flight only', async () => {
    const { c, client } = setup();
    c.setInputs(token(1), undefined, 'k1');
    const p: Progress = { runPhase: 'sampling', done: 4096, total: 20000, elapsedMs: 31 };
    client.last.options.onProgress?.(p);
    expect(c.getSnapshot().progress).toEqual(p);
    const first = client.last;
    client.last.resolve(fakeResult('a'));
    await vi.waitFor(() => expect(c.getSnapshot().status).toBe('done'));
    expect(c.getSnapshot().progress).toBeNull();
    c.setInputs(token(2), undefined, 'k2');
    first.options.onProgress?.({ ...p, done: 99 });
    expect(c.getSnapshot().progress).toBeNull();
  });

  it('debounces changes, cancels the run in flight and keeps the previous result until the new one is ready', async () => {
    const { c, client } = setup();
    c.setInputs(token(1), { d: 1 }, 'k1');
    client.last.resolve(fakeResult('one'));
    await vi.waitFor(() => expect(c.getSnapshot().status).toBe('done'));

    c.setInputs(token(1), { d: 2 }, 'k2');
    expect(c.getSnapshot().status).toBe('waiting');
    expect(c.getSnapshot().stale).toBe(true);
    expect(c.getSnapshot().result?.title).toBe('one');
    vi.advanceTimersByTime(100);
    c.setInputs(token(1), { d: 3 }, 'k3');
    vi.advanceTimersByTime(149);
    expect(client.calls).toHaveLength(1);
    vi.advanceTimersByTime(1);
    expect(client.calls).toHaveLength(2);
    expect(client.last.options.dialValues).toEqual({ d: 3 });
    expect(c.getSnapshot().status).toBe('running');
    expect(c.getSnapshot().result?.title).toBe('one');

    // A change while running cancels that run at once and starts again after the debounce.
    const running = client.last;
    c.setInputs(token(1), { d: 4 }, 'k4');
    expect(running.cancelled).toBe(true);
    expect(c.getSnapshot().status).toBe('waiting');
    running.resolve(fakeResult('late'));
    vi.advanceTimersByTime(150);
    client.last.resolve(fakeResult('four'));
    await vi.waitFor(() => expect(c.getSnapshot().result?.title).toBe('four'));
    expect(c.getSnapshot().stale).toBe(false);
    expect(c.getSnapshot().runs).toBe(2);
  });

  it('ignores unchanged inputs and returns to a result already on screen without running', async () => {
    const { c, client } = setup();
    c.setInputs(token(1), undefined, 'k1');
    client.last.resolve(fakeResult('one'));
    await vi.waitFor(() => expect(c.getSnapshot().status).toBe('done'));
    c.setInputs(token(1), undefined, 'k1');
    expect(client.calls).toHaveLength(1);
    c.setInputs(token(2), undefined, 'k2');
    c.setInputs(token(1), undefined, 'k1');
    vi.advanceTimersByTime(500);
    expect(client.calls).toHaveLength(1);
    expect(c.getSnapshot().status).toBe('done');
    expect(c.getSnapshot().stale).toBe(false);
  });

  it('shows the engine’s error with its located issues and keeps the last good result', async () => {
    const { c, client } = setup();
    c.setInputs(token(1), undefined, 'k1');
    client.last.resolve(fakeResult('good'));
    await vi.waitFor(() => expect(c.getSnapshot().status).toBe('done'));
    c.setInputs(token('bad'), undefined, 'k2');
    vi.advanceTimersByTime(150);
    client.last.reject(new ModelValidationError([{ path: ['dialValues', 'spacer_length'], message: 'The value 30 is outside its range.' }]));
    await vi.waitFor(() => expect(c.getSnapshot().status).toBe('error'));
    const s = c.getSnapshot();
    expect(s.error?.message).toMatch(/^Invalid model: dialValues\.spacer_length: The value 30 is outside its range\./);
    expect(s.error?.issues).toHaveLength(1);
    expect(s.result?.title).toBe('good');
    expect(s.stale).toBe(true);
    // Fixing the input clears the error when the new result arrives.
    c.setInputs(token(3), undefined, 'k3');
    vi.advanceTimersByTime(150);
    client.last.resolve(fakeResult('fixed'));
    await vi.waitFor(() => expect(c.getSnapshot().status).toBe('done'));
    expect(c.getSnapshot().error).toBeNull();
  });

  it('cancel keeps the previous result; the same inputs can be run again later', async () => {
    const { c, client } = setup();
    c.setInputs(token(1), undefined, 'k1');
    client.last.resolve(fakeResult('one'));
    await vi.waitFor(() => expect(c.getSnapshot().status).toBe('done'));
    c.setInputs(token(2), undefined, 'k2');
    vi.advanceTimersByTime(150);
    c.cancel();
    expect(client.last.cancelled).toBe(true);
    await Promise.resolve();
    expect(c.getSnapshot().status).toBe('done');
    expect(c.getSnapshot().result?.title).toBe('one');
    c.setInputs(token(2), undefined, 'k2');
    vi.advanceTimersByTime(150);
    expect(client.calls).toHaveLength(3);
  });

  it('dispose ends the worker; a remount (React strict mode) runs again on a new one', () => {
    vi.useFakeTimers();
    const clients: FakeClient[] = [];
    const c = new SimulationController({
      client: () => {
        const f = new FakeClient();
        clients.push(f);
        return f;
      },
    });
    expect(clients).toHaveLength(0);
    c.setInputs(token(1), undefined, 'k1');
    expect(clients).toHaveLength(1);
    c.dispose();
    expect(clients[0].terminated).toBe(1);
    expect(clients[0].last.cancelled).toBe(true);
    c.setInputs(token(1), undefined, 'k1');
    expect(clients).toHaveLength(2);
    expect(clients[1].calls).toHaveLength(1);
  });

  it('uses a new sample selection handed in with new inputs', async () => {
    const { c, client } = setup();
    c.setInputs(token(1), undefined, 'k1');
    expect(client.last.options.samples).toBe('all');
    client.last.resolve(fakeResult('one'));
    await vi.waitFor(() => expect(c.getSnapshot().status).toBe('done'));
    c.setInputs(token(2), undefined, 'k2', 'none');
    vi.advanceTimersByTime(150);
    expect(client.last.options.samples).toBe('none');
  });

  it('goes idle when there is no model', async () => {
    const { c, client } = setup();
    c.setInputs(null, undefined, 'none');
    expect(client.calls).toHaveLength(0);
    expect(c.getSnapshot().status).toBe('idle');
  });
});

describe('SimulationController, posting order and quick single changes', () => {
  it('runs a lone change at once, but debounces a burst', async () => {
    const { c, client, tick } = setup(30);
    c.setInputs(token(1), { d: 1 }, 'k1');
    client.last.resolve(fakeResult('one'));
    await vi.waitFor(() => expect(c.getSnapshot().status).toBe('done'));
    tick(500);
    c.setInputs(token(1), { d: 2 }, 'k2');
    expect(client.calls).toHaveLength(2);
    expect(c.getSnapshot().status).toBe('running');
    tick(5);
    c.setInputs(token(1), { d: 3 }, 'k3');
    expect(client.calls).toHaveLength(2);
    expect(c.getSnapshot().status).toBe('waiting');
    vi.advanceTimersByTime(30);
    expect(client.calls).toHaveLength(3);
    expect(client.last.options.dialValues).toEqual({ d: 3 });
  });

  it('shows the headline step at once, the earlier charts meanwhile, and the full result last', async () => {
    const { c, client, tick } = setup(30);
    const out = (mean: number, bins: number) => ({ id: 'gap', mean, histogram: Array.from({ length: bins }, () => ({ x0: 0, x1: 1, count: 1 })), ecdf: [], drivers: { method: 'spearman', trials: bins, items: [] } });
    const result = (mean: number, bins: number) => ({ template: 'formula', title: `m${mean}`, inputs: [], correlation: [], stack: null, outputs: [out(mean, bins)] }) as unknown as RunResult;
    c.setInputs(token(1), { d: 1 }, 'k1');
    client.last.resolve(result(1, 3));
    await vi.waitFor(() => expect(c.getSnapshot().status).toBe('done'));
    tick(100);
    c.setInputs(token(1), { d: 2 }, 'k2');
    client.last.options.onStage?.('headline', result(2, 0));
    let s = c.getSnapshot();
    expect(s.status).toBe('running');
    expect(s.stale).toBe(false);
    expect(s.pending).toBe('charts');
    expect(s.result?.outputs[0].mean).toBe(2);
    expect(s.result?.outputs[0].histogram).toHaveLength(3); // the previous run's, until the charts step
    // The charts step is shown only when the complete result does not follow within a frame.
    client.last.options.onStage?.('charts', result(2, 5));
    expect(c.getSnapshot().pending).toBe('charts');
    vi.advanceTimersByTime(16);
    expect(c.getSnapshot().pending).toBe('drivers');
    expect(c.getSnapshot().result?.outputs[0].histogram).toHaveLength(5);
    client.last.resolve(result(2, 5));
    await vi.waitFor(() => expect(c.getSnapshot().status).toBe('done'));
    s = c.getSnapshot();
    expect(s.pending).toBeNull();
    expect(s.result?.title).toBe('m2');
    // A stopped run leaves its headline step flagged stale, and its inputs can be run again.
    tick(100);
    c.setInputs(token(1), { d: 3 }, 'k3');
    client.last.options.onStage?.('headline', result(3, 0));
    c.cancel();
    expect(c.getSnapshot().stale).toBe(true);
    expect(c.getSnapshot().pending).toBeNull();
  });
});
