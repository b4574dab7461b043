import { NextResponse, type NextRequest } from 'next/server';
import { API_CSP, HSTS, pageCsp } from '@/lib/server/security-headers';
import { bodyLimitFor, tooLargeMessage } from '@/lib/server/body-limits';

/**
 * Runs before every route (static assets excepted):
 * - refuses a body over its route's limit with 413 before anything reads it;
 * - a fresh CSP nonce per page request (passed to Next.js on the request so its scripts carry it);
 * - HSTS when served over HTTPS.
 * The headers that do not vary (nosniff, framing, referrer, permissions) come from next.config.ts.
 */
export function proxy(request: NextRequest) {
  const path = request.nextUrl.pathname;
  const isApi = path.startsWith('/api/');
  const secure = process.env.LAGWISE_SECURE_COOKIES === '1' || request.nextUrl.protocol === 'https:';

  if (!['GET', 'HEAD', 'OPTIONS'].includes(request.method)) {
    const limit = bodyLimitFor(path, request.method);
    const length = Number(request.headers.get('content-length') ?? '0');
    if (Number.isFinite(length) && length > limit) {
      const message = tooLargeMessage(limit);
      const res =
        isApi || request.headers.get('next-action')
          ? NextResponse.json({ error: { code: 'too_large', message } }, { status: 413 })
          : new NextResponse(message, {
              status: 413,
              headers: { 'content-type': 'text/plain; charset=utf-8' },
            });
      res.headers.set('Content-Security-Policy', API_CSP);
      res.headers.set('Connection', 'close');
      return res;
    }
  }

  let response: NextResponse;
  if (isApi) {
    response = NextResponse.next();
    response.headers.set('Content-Security-Policy', API_CSP);
  } else {
    const nonce = Buffer.from(crypto.getRandomValues(new Uint8Array(18))).toString('base64');
    const devIssuer = process.env.OIDC_DEV_ISSUER ? [new URL(process.env.OIDC_DEV_ISSUER).origin] : [];
    const csp = pageCsp({
      nonce,
      dev: process.env.NODE_ENV === 'development',
      secure,
      formTargets: devIssuer,
    });
    const requestHeaders = new Headers(request.headers);
    requestHeaders.set('x-nonce', nonce);
    requestHeaders.set('Content-Security-Policy', csp);
    response = NextResponse.next({ request: { headers: requestHeaders } });
    response.headers.set('Content-Security-Policy', csp);
  }
  if (secure) response.headers.set('Strict-Transport-Security', HSTS);
  return response;
}

export const config = {
  matcher: ['/((?!_next/static|_next/image|favicon.ico).*)'],
};
