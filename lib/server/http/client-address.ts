import 'server-only';
import { BlockList, isIP } from 'node:net';
import { env } from '@/lib/server/env';

// The client's network address for rate limits. It starts from the TCP peer (stamped by lib/server/http/socket-peer.mjs,
// preloaded into the server) and walks X-Forwarded-For or Forwarded from the right only while the hop that
// added the entry is one of TRUSTED_PROXIES. With no trusted proxies, forwarded headers are ignored entirely.

const PEER_HEADER = 'x-stochos-peer';
const PRELOADED = Symbol.for('stochos.socketPeer');

type HeaderGet = (name: string) => string | null | undefined;

/** '::ffff:192.0.2.1' → '192.0.2.1'; '[2001:db8::1]:443' / '192.0.2.1:8080' → the address; anything else → null. */
export function normaliseAddress(raw: string): string | null {
  let s = raw.trim().replace(/^"|"$/g, '');
  const bracket = /^\[([^\]]+)\](?::\d+)?$/.exec(s);
  if (bracket) s = bracket[1]!;
  else if (/^\d{1,3}(\.\d{1,3}){3}:\d+$/.test(s)) s = s.slice(0, s.lastIndexOf(':'));
  const mapped = /^::ffff:(\d{1,3}(\.\d{1,3}){3})$/i.exec(s);
  if (mapped) s = mapped[1]!;
  return isIP(s) ? s.toLowerCase() : null;
}

/** Parses TRUSTED_PROXIES ("10.0.0.0/8, 192.0.2.7, ::1"); throws naming the first bad entry. */
export function parseTrustedProxies(list: string): BlockList {
  const block = new BlockList();
  for (const entry of list.split(/[\s,]+/).filter(Boolean)) {
    const [addr, bits, extra] = entry.split('/');
    const a = addr ? normaliseAddress(addr) : null;
    const type = a && isIP(a) === 6 ? 'ipv6' : 'ipv4';
    const max = type === 'ipv6' ? 128 : 32;
    const prefix = bits === undefined ? max : Number(bits);
    if (!a || extra !== undefined || !Number.isInteger(prefix) || prefix < 0 || prefix > max || (bits !== undefined && !/^\d+$/.test(bits))) {
      throw new Error(`TRUSTED_PROXIES: "${entry}" is not an IP address or CIDR range (e.g. 10.0.0.0/8, 192.0.2.7, ::1)`);
    }
    block.addSubnet(a, prefix, type);
  }
  return block;
}

/** The addresses a forwarded header lists, left (original client) to right (nearest hop); null for an unreadable entry. */
export function forwardedChain(header: 'x-forwarded-for' | 'forwarded', value: string | null | undefined): (string | null)[] {
  if (!value) return [];
  const parts = value.split(',').map((p) => p.trim()).filter(Boolean);
  if (header === 'x-forwarded-for') return parts.map(normaliseAddress);
  return parts.map((p) => {
    const pair = p.split(';').map((x) => x.trim()).find((x) => /^for=/i.test(x));
    return pair ? normaliseAddress(pair.slice(4)) : null;
  });
}

let cachedList: { source: string; block: BlockList } | null = null;
function trusted(): BlockList {
  const source = env().TRUSTED_PROXIES;
  if (cachedList?.source !== source) cachedList = { source, block: parseTrustedProxies(source) };
  return cachedList.block;
}

const isTrusted = (block: BlockList, a: string) => block.check(a, isIP(a) === 6 ? 'ipv6' : 'ipv4');

let warned = false;

/**
 * The client address as decided from the socket peer and the trusted proxies. Without the preload (for
 * example under `next dev`) no address can be trusted, so every request shares the bucket "unknown".
 */
export function clientAddressFrom(get: HeaderGet, o: { peer?: string | null; trustedProxies?: BlockList; header?: 'x-forwarded-for' | 'forwarded' } = {}): string {
  const stamped = o.peer !== undefined ? o.peer : (globalThis as Record<symbol, unknown>)[PRELOADED] ? get(PEER_HEADER) : null;
  const peer = stamped ? normaliseAddress(stamped) : null;
  if (!peer) {
    if (!warned && o.peer === undefined) {
      warned = true;
      console.warn('[client address] the socket peer is unknown (start the server with `node --import ./lib/server/http/socket-peer.mjs`, as `npm start` does); rate limits by address share one bucket.');
    }
    return 'unknown';
  }
  const block = o.trustedProxies ?? trusted();
  if (!isTrusted(block, peer)) return peer;
  const header = o.header ?? env().TRUSTED_PROXY_HEADER;
  const chain = forwardedChain(header, get(header));
  let addr = peer;
  for (let i = chain.length - 1; i >= 0; i--) {
    const hop = chain[i];
    // An unreadable entry ends the walk: the last hop that a trusted proxy vouched for stands.
    if (!hop) return addr;
    addr = hop;
    if (!isTrusted(block, hop)) return hop;
  }
  return addr;
}

/** The client address of a route handler's request. */
export const clientAddress = (req: Request) => clientAddressFrom((n) => req.headers.get(n));

/** next-auth hands `authorize` the headers as a plain object. */
export const clientAddressOfHeaders = (headers: Record<string, unknown> | undefined) =>
  clientAddressFrom((n) => {
    const v = headers?.[n];
    return typeof v === 'string' ? v : Array.isArray(v) ? v.join(', ') : null;
  });
