/**
 * Response headers every answer carries, and the Content-Security-Policy for pages.
 * Pure (no Next imports) so next.config.ts, proxy.ts and the tests share one definition.
 */

/** On every response, static files included (next.config.ts `headers()`). */
export const STATIC_SECURITY_HEADERS: Record<string, string> = {
  'X-Content-Type-Options': 'nosniff',
  'X-Frame-Options': 'DENY',
  'Referrer-Policy': 'strict-origin-when-cross-origin',
  'Permissions-Policy': 'camera=(), microphone=(), geolocation=(), payment=(), usb=(), interest-cohort=()',
  'Cross-Origin-Opener-Policy': 'same-origin',
};

export const HSTS = 'max-age=63072000; includeSubDomains';

/** JSON, downloads and other non-HTML answers: nothing may load, nothing may frame them. */
export const API_CSP = "default-src 'none'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'";

/**
 * The policy for HTML pages: scripts only with this request's nonce (Next.js attaches it to its
 * own scripts when the page renders dynamically) and what they load ('strict-dynamic'); styles
 * from our origin plus inline style attributes (charts and layout set them); no framing at all,
 * so sign-off and bill-issue pages cannot be click-jacked.
 */
export function pageCsp(o: { nonce: string; dev: boolean; secure: boolean; formTargets?: string[] }): string {
  const parts = [
    "default-src 'self'",
    `script-src 'self' 'nonce-${o.nonce}' 'strict-dynamic'${o.dev ? " 'unsafe-eval'" : ''}`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' blob: data:",
    "font-src 'self'",
    `connect-src 'self'${o.dev ? ' ws: wss:' : ''}`,
    "object-src 'none'",
    "base-uri 'self'",
    // Company sign-in posts a form whose answer redirects to the organization's identity provider.
    `form-action 'self' https:${(o.formTargets ?? []).map((t) => ` ${t}`).join('')}`,
    "frame-ancestors 'none'",
  ];
  if (o.secure) parts.push('upgrade-insecure-requests');
  return parts.join('; ');
}
