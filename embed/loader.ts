// The loader an integrator's page includes once. It turns every placeholder of the Stochos snippet into an
// iframe on the Stochos app and keeps each frame's height fitted to its content (iframe-resizer 4.4.5, parent
// side, accepting messages only from the app's own origin). Several widgets on one page each get their own frame.
// The pass token never goes into the frame's URL (where server logs and history would keep it): the frame asks
// for it by postMessage, and gets it only when the message comes from that very frame at the app's origin.
import iframeResize from 'iframe-resizer/js/iframeResizer.js';

interface StochosEmbedApi {
  /** Mounts placeholders added after the page loaded (single-page portals call this after rendering). */
  scan: (root?: ParentNode) => void;
  appOrigin: string;
}

declare global {
  interface Window {
    StochosEmbed?: StochosEmbedApi;
  }
}

const SELECTOR = '[data-stochos-pass]';

interface Mounted {
  frame: HTMLIFrameElement;
  passId: string;
  token: string;
}
const mounted: Mounted[] = [];

/** Hands a frame its pass when it asks: only to that frame's window, only at the app's origin. */
function answerPassRequests(appOrigin: string): void {
  window.addEventListener('message', (e: MessageEvent) => {
    if (e.origin !== appOrigin) return;
    const d = e.data as { type?: unknown; passId?: unknown } | null;
    if (!d || typeof d !== 'object' || d.type !== 'stochos:ready') return;
    const m = mounted.find((x) => x.frame.contentWindow === e.source && x.passId === d.passId);
    m?.frame.contentWindow?.postMessage({ type: 'stochos:pass', passId: m.passId, token: m.token }, appOrigin);
  });
}
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
const LOADER_FILE = /\/embed\/stochos-embed\.js(\?.*)?$/;

function loaderOrigin(): string | null {
  const own = document.currentScript as HTMLScriptElement | null;
  const src = own?.src || Array.from(document.scripts).find((s) => LOADER_FILE.test(s.src))?.src;
  if (!src) return null;
  try {
    return new URL(src, location.href).origin;
  } catch {
    return null;
  }
}

function notice(el: HTMLElement, text: string): void {
  const p = document.createElement('p');
  p.textContent = text;
  p.setAttribute('role', 'status');
  p.style.cssText = 'margin:0;padding:12px 14px;border:1px solid #d4d9dd;border-radius:6px;font:14px/1.4 system-ui,sans-serif;color:#333;background:#fafafa';
  el.replaceChildren(p);
}

function mount(el: HTMLElement, appOrigin: string): void {
  if (el.dataset.stochosMounted) return;
  el.dataset.stochosMounted = '1';
  const passId = (el.dataset.stochosPass ?? '').trim();
  const token = (el.dataset.stochosToken ?? '').trim();
  if (!UUID.test(passId) || token.split('.').length !== 3) {
    notice(el, 'This Stochos widget snippet is incomplete or altered. Paste it again exactly as it was supplied.');
    return;
  }
  const src = new URL(`/embed/${encodeURIComponent(passId)}`, appOrigin);
  // The page checks this against the client's allowed origins and talks only to it.
  src.searchParams.set('origin', location.origin);

  const frame = document.createElement('iframe');
  frame.src = src.toString();
  frame.title = el.dataset.stochosTitle?.trim() || 'Interactive risk model';
  // The app needs no Referer: the host page's address stays private.
  frame.referrerPolicy = 'no-referrer';
  frame.setAttribute('scrolling', 'no');
  frame.style.cssText = 'display:block;width:1px;min-width:100%;height:360px;border:0;overflow:hidden;background:transparent';
  el.replaceChildren(frame);
  mounted.push({ frame, passId, token });
  iframeResize({ checkOrigin: [appOrigin], heightCalculationMethod: 'documentElementOffset', tolerance: 1, log: false }, frame);
}

(function start() {
  if (window.StochosEmbed) {
    // The loader was included twice: the first copy mounts whatever is new.
    window.StochosEmbed.scan();
    return;
  }
  const appOrigin = loaderOrigin();
  if (!appOrigin) return;
  const scan = (root: ParentNode = document) => root.querySelectorAll<HTMLElement>(SELECTOR).forEach((el) => mount(el, appOrigin));
  window.StochosEmbed = { scan, appOrigin };
  answerPassRequests(appOrigin);
  if (document.readyState === 'loading') document.addEventListener('DOMContentLoaded', () => scan());
  else scan();
})();
