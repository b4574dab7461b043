/**
 * Outbound HTTP for company sign-in (discovery, token, keys, userinfo). Every address the server
 * fetches here comes from an organization owner's settings or from a document that address served,
 * so it is treated as hostile:
 *
 * - https only in production; outside production plain http is allowed for the configured local
 *   identity provider's origin (OIDC_DEV_ISSUER) and nothing else;
 * - the host name is resolved and every address checked at connect time (the check sits in the
 *   socket's own `lookup`, so a second DNS answer cannot slip a private address in after the check):
 *   loopback, private, link-local, carrier-grade NAT, unique-local, multicast and unspecified ranges
 *   are refused — except the local provider's origin outside production;
 * - no redirects, a short time-out for the whole exchange and a cap on the response size;
 * - whatever goes wrong, the caller sees one generic message (OUTBOUND_ERROR), so the answers do not
 *   map what listens where. Details go to the server log.
 */
import { lookup as dnsLookup, type LookupAddress } from 'node:dns';
import { request as httpRequest, type IncomingMessage } from 'node:http';
import { request as httpsRequest } from 'node:https';
import { isIP, BlockList } from 'node:net';
import { AppError } from '@/lib/errors';
import { env } from '@/lib/env';

export const OUTBOUND_ERROR =
  'The company sign-in service could not be used. Check the issuer in the company sign-in settings, or try again later.';
export const OUTBOUND_TIMEOUT_MS = Number(process.env.OIDC_TIMEOUT_MS ?? 4000);
export const OUTBOUND_MAX_BYTES = 256 * 1024;

const blocked = new BlockList();
for (const [net, bits] of [
  ['0.0.0.0', 8],
  ['10.0.0.0', 8],
  ['100.64.0.0', 10],
  ['127.0.0.0', 8],
  ['169.254.0.0', 16],
  ['172.16.0.0', 12],
  ['192.0.0.0', 24],
  ['192.0.2.0', 24],
  ['192.168.0.0', 16],
  ['198.18.0.0', 15],
  ['198.51.100.0', 24],
  ['203.0.113.0', 24],
  ['224.0.0.0', 4],
  ['240.0.0.0', 4],
] as const)
  blocked.addSubnet(net, bits, 'ipv4');
for (const [net, bits] of [
  ['::', 128],
  ['::1', 128],
  ['fc00::', 7],
  ['fe80::', 10],
  ['fec0::', 10],
  ['ff00::', 8],
  ['2001:db8::', 32],
  ['64:ff9b::', 96],
  ['100::', 64],
] as const)
  blocked.addSubnet(net, bits, 'ipv6');

/** Whether an IP address is one the server must never be made to contact (IPv4-mapped IPv6 included). */
export function isForbiddenAddress(address: string): boolean {
  const family = isIP(address);
  if (!family) return true;
  if (family === 6) {
    const lower = address.toLowerCase();
    const mapped = lower.match(/^::ffff:(\d+\.\d+\.\d+\.\d+)$/);
    if (mapped) return isForbiddenAddress(mapped[1]);
    if (/^::ffff:[0-9a-f]{1,4}:[0-9a-f]{1,4}$/.test(lower)) {
      const [hi, lo] = lower
        .slice(7)
        .split(':')
        .map((h) => parseInt(h, 16));
      return isForbiddenAddress(`${hi >> 8}.${hi & 255}.${lo >> 8}.${lo & 255}`);
    }
    return blocked.check(address, 'ipv6');
  }
  return blocked.check(address, 'ipv4');
}

/** The origin of the local identity provider the scripts start — the one development exception. */
export function devProviderOrigin(): string | null {
  if (env.isProduction()) return null;
  const issuer = process.env.OIDC_DEV_ISSUER;
  try {
    return issuer ? new URL(issuer).origin : null;
  } catch {
    return null;
  }
}

/**
 * Why a URL may not be fetched at all (before any DNS), or null when it may be tried. Used when an
 * owner saves the issuer (to say which field is wrong) and before every request.
 */
export function urlRefusal(raw: string): string | null {
  let u: URL;
  try {
    u = new URL(raw);
  } catch {
    return 'not a valid URL';
  }
  if (u.username || u.password) return 'credentials in the URL';
  if (devProviderOrigin() === u.origin) return null;
  if (u.protocol !== 'https:') return 'not https';
  const host = u.hostname.replace(/^\[|\]$/g, '');
  if (isIP(host) && isForbiddenAddress(host)) return 'a private or loopback address';
  if (/^(localhost|.*\.localhost|.*\.local|.*\.internal)$/i.test(host)) return 'a local host name';
  return null;
}

type LookupCb = (
  err: NodeJS.ErrnoException | null,
  address: string | LookupAddress[],
  family?: number,
) => void;

/** A `lookup` for the socket that resolves and refuses forbidden addresses (pinned: the checked address is the one used). */
function guardedLookup(allowPrivate: boolean) {
  return (hostname: string, options: object, cb: LookupCb) => {
    dnsLookup(hostname, { ...options, all: true }, (err, addresses) => {
      if (err) return cb(err, []);
      const list = addresses as LookupAddress[];
      const bad = list.find((a) => isForbiddenAddress(a.address));
      if (!allowPrivate && (bad || !list.length)) {
        const e = new Error(
          `refused address ${bad?.address ?? '(none)'} for ${hostname}`,
        ) as NodeJS.ErrnoException;
        e.code = 'EREFUSEDADDRESS';
        return cb(e, []);
      }
      if ((options as { all?: boolean }).all) return cb(null, list);
      cb(null, list[0].address, list[0].family);
    });
  };
}

export interface OutboundResponse {
  status: number;
  json: unknown;
}

/** One request under the rules above. Throws AppError('unsupported', OUTBOUND_ERROR) on every failure. */
export async function outboundJson(
  url: string,
  init: {
    method?: 'GET' | 'POST';
    headers?: Record<string, string>;
    body?: string;
    okStatuses?: number[];
  } = {},
): Promise<OutboundResponse> {
  const refusal = urlRefusal(url);
  if (refusal) {
    console.error('[sso outbound] refused before connecting:', refusal, safeForLog(url));
    throw new AppError('unsupported', OUTBOUND_ERROR);
  }
  const u = new URL(url);
  const allowPrivate = devProviderOrigin() === u.origin;
  try {
    const res = await new Promise<{ status: number; body: string }>((resolve, reject) => {
      const req = (u.protocol === 'https:' ? httpsRequest : httpRequest)(
        u,
        {
          method: init.method ?? 'GET',
          headers: { accept: 'application/json', ...(init.headers ?? {}) },
          lookup: guardedLookup(allowPrivate) as never,
          timeout: OUTBOUND_TIMEOUT_MS,
        },
        (r: IncomingMessage) => {
          let size = 0;
          const chunks: Buffer[] = [];
          r.on('data', (c: Buffer) => {
            size += c.length;
            if (size > OUTBOUND_MAX_BYTES) {
              req.destroy(new Error(`response over ${OUTBOUND_MAX_BYTES} bytes`));
              return;
            }
            chunks.push(c);
          });
          r.on('end', () =>
            resolve({ status: r.statusCode ?? 0, body: Buffer.concat(chunks).toString('utf8') }),
          );
          r.on('error', reject);
        },
      );
      // The whole exchange, not only the idle gaps, is bounded.
      const timer = setTimeout(() => req.destroy(new Error('time-out')), OUTBOUND_TIMEOUT_MS);
      req.on('close', () => clearTimeout(timer));
      req.on('timeout', () => req.destroy(new Error('time-out')));
      req.on('error', reject);
      if (init.body) req.write(init.body);
      req.end();
    });
    const ok = init.okStatuses ?? [200];
    if (!ok.includes(res.status)) throw new Error(`status ${res.status}`);
    return { status: res.status, json: JSON.parse(res.body) };
  } catch (e) {
    console.error('[sso outbound] failed:', (e as Error).message, safeForLog(url));
    throw new AppError('unsupported', OUTBOUND_ERROR);
  }
}

const safeForLog = (url: string) => {
  try {
    const u = new URL(url);
    return `${u.origin}${u.pathname}`;
  } catch {
    return '(bad url)';
  }
};
