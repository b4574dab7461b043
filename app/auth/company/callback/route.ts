import { cookies } from 'next/headers';
import { NextResponse, type NextRequest } from 'next/server';
import { completeSso, LINK_TTL_MINUTES } from '@/lib/auth/sso';
import { setSessionCookie } from '@/lib/auth/session';
import { isAppError } from '@/lib/errors';
import { env } from '@/lib/env';
import { LINK_COOKIE, SSO_COOKIE, SSO_MESSAGE_COOKIE } from '@/lib/auth/cookie-names';
import { logUnexpected } from '@/lib/log';

export const dynamic = 'force-dynamic';

/**
 * Where the company's identity provider sends the browser back. No session yet, so this handler
 * checks the state and PKCE verifier it left in a cookie instead; every outcome ends on a page
 * that says what happened.
 */
export async function GET(req: NextRequest) {
  const jar = await cookies();
  const raw = jar.get(SSO_COOKIE)?.value;
  jar.delete({ name: SSO_COOKIE, path: '/auth/company' });
  let expected = null;
  try {
    expected = raw ? JSON.parse(raw) : null;
  } catch {
    expected = null;
  }
  const to = (path: string) => NextResponse.redirect(new URL(path, env.appUrl()), 303);
  const say = (message: string) => {
    jar.set(SSO_MESSAGE_COOKIE, message, { httpOnly: true, sameSite: 'lax', path: '/', maxAge: 60 });
    return to('/sign-in?company=1');
  };
  if (req.nextUrl.searchParams.get('error'))
    return say(`The company sign-in was cancelled or refused (${req.nextUrl.searchParams.get('error')}).`);
  try {
    const out = await completeSso({
      code: req.nextUrl.searchParams.get('code'),
      state: req.nextUrl.searchParams.get('state'),
      expected,
    });
    if (out.kind === 'pending')
      return say(
        `Signed in with your company account. An owner of ${out.organizationName} still has to give you a role; you will be able to open projects after that.`,
      );
    if (out.kind === 'blocked')
      return say(
        `Signed in with your company account, but an owner of ${out.organizationName} has ended or refused your membership. Ask an owner to invite you again.`,
      );
    if (out.kind === 'link-required') {
      // The linking secret lives only in this browser's httpOnly cookie; the mailed link works only together with it.
      jar.set(LINK_COOKIE, out.linkToken, {
        httpOnly: true,
        sameSite: 'lax',
        path: '/',
        maxAge: LINK_TTL_MINUTES * 60,
        secure: env.isProduction(),
      });
      return say(
        out.hasPassword
          ? `${out.email} already has a Lagwise account. To link your company account, sign in with its password once, or e-mail yourself a one-time link and open it in this browser.`
          : `${out.email} already has a Lagwise account. To link this company account, e-mail yourself a one-time link and open it in this browser.`,
      );
    }
    // A new session for this browser; the one it had before (if any) ends.
    await setSessionCookie(out.session.id);
    return to('/projects');
  } catch (e) {
    if (isAppError(e)) return say(e.message);
    logUnexpected('sso callback', e);
    return say('The company sign-in could not be completed. Try again, or sign in with your password.');
  }
}
