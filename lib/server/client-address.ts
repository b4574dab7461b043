/**
 * The client's network address, as far as the server can trust it.
 *
 * `X-Forwarded-For` is written by whoever sends the request, so it is believed only behind
 * proxies the operator declares: `TRUST_PROXY=<hops>` says how many proxies in front of Lagwise
 * append to the header; the client is then the entry that many places from the right (the
 * entries further left were written by the client and are ignored). Without `TRUST_PROXY`,
 * no header is believed and the address is `unknown`: sign-in throttling then works per
 * account alone (lib/auth/throttle.ts), which a forged header cannot get round.
 */
import { isIP } from 'node:net';

type HeaderSource = { get(name: string): string | null };

export function trustedProxyHops(): number {
  const raw = (process.env.TRUST_PROXY ?? '').trim().toLowerCase();
  if (raw === '' || raw === '0' || raw === 'false') return 0;
  if (raw === 'true') return 1;
  const n = Number(raw);
  return Number.isInteger(n) && n > 0 && n < 20 ? n : 0;
}

export const UNKNOWN_ADDRESS = 'unknown';

export function clientAddressFrom(h: HeaderSource, hops = trustedProxyHops()): string {
  if (hops <= 0) return UNKNOWN_ADDRESS;
  const list = (h.get('x-forwarded-for') ?? '')
    .split(',')
    .map((s) => s.trim())
    .filter(Boolean);
  if (list.length === 0) return UNKNOWN_ADDRESS;
  // The nearest trusted proxy appended the address it saw last; `hops` proxies → that many from the right.
  const candidate = list[Math.max(0, list.length - hops)];
  const bare = candidate.replace(/^\[(.*)\](?::\d+)?$/, '$1').replace(/^(\d+\.\d+\.\d+\.\d+):\d+$/, '$1');
  return isIP(bare) ? bare.toLowerCase() : UNKNOWN_ADDRESS;
}

const LOOPBACK = /^(127\.\d+\.\d+\.\d+|::1|::ffff:127\.\d+\.\d+\.\d+|localhost)$/i;
export const isLoopbackAddress = (a: string) => LOOPBACK.test(a.replace(/^\[|\]$/g, ''));

/**
 * True when the request can only have come from this machine: the server is bound to a loopback
 * address, and — behind declared proxies — the client they report is on loopback too.
 */
export function isLoopbackRequest(h: HeaderSource): boolean {
  if (!isLoopbackAddress(process.env.HOST ?? '127.0.0.1')) return false;
  return trustedProxyHops() === 0 || isLoopbackAddress(clientAddressFrom(h));
}
