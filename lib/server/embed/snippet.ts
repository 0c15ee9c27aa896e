// The one snippet an integrator pastes: a placeholder element and the loader script. Pure, shared by the
// dashboard and the demo host page.

export const LOADER_PATH = '/embed/stochos-embed.js';

const attr = (s: string) => s.replace(/&/g, '&amp;').replace(/"/g, '&quot;').replace(/</g, '&lt;').replace(/>/g, '&gt;');

export interface SnippetInput {
  appUrl: string;
  passId: string;
  token: string;
  title: string;
}

export function embedSnippet(s: SnippetInput): string {
  const base = s.appUrl.replace(/\/+$/, '');
  return [
    `<div data-stochos-pass="${attr(s.passId)}" data-stochos-token="${attr(s.token)}" data-stochos-title="${attr(s.title)}"></div>`,
    `<script async src="${attr(base + LOADER_PATH)}"></script>`,
  ].join('\n');
}

/**
 * A direct link to the embed page, for a check in a browser. The pass rides in the fragment, which the browser
 * never sends to a server (nor to its logs); the page reads it and removes it from the address at once.
 */
export function embedPageUrl(s: { appUrl: string; passId: string; token: string; origin?: string | null }): string {
  const u = new URL(`/embed/${encodeURIComponent(s.passId)}`, s.appUrl);
  if (s.origin) u.searchParams.set('origin', s.origin);
  u.hash = new URLSearchParams({ pass: s.token }).toString();
  return u.toString();
}
