import { vi } from 'vitest';

// Replaces fetch at a unit test's edge: each call gets the next prepared Response (or throws the next Error).
export const calls: { url: string; init: RequestInit }[] = [];

export function answer(...responses: (Response | Error)[]): void {
  calls.length = 0;
  const queue = [...responses];
  vi.stubGlobal('fetch', async (url: string, init: RequestInit) => {
    calls.push({ url, init });
    const next = queue.shift();
    if (!next) throw new Error('no more answers');
    if (next instanceof Error) throw next;
    return next;
  });
}
