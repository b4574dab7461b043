'use server';
import { redirect } from 'next/navigation';
import { parseWithZod } from '@conform-to/zod/v4';
import type { SubmissionResult } from '@conform-to/react';
import { formSchemas } from '@/lib/forms/schemas';
import * as auth from '@/lib/auth/service';
import { clearSessionCookie, clientIp, setSessionCookie, validateRequest } from '@/lib/auth/session';
import { isAppError } from '@/lib/errors';
import { cookies } from 'next/headers';
import * as sso from '@/lib/auth/sso';
import { LINK_COOKIE, SSO_COOKIE, SSO_MESSAGE_COOKIE } from '@/lib/auth/cookie-names';
import { env } from '@/lib/env';
import { logUnexpected } from '@/lib/log';

// Account actions run before there is a session, so they do not use the role wrapper;
// each still parses on the server and answers with conform field errors.
function failed(
  submission: { reply: (o: object) => SubmissionResult<string[]> },
  e: unknown,
): SubmissionResult<string[]> {
  if (isAppError(e))
    return submission.reply({
      formErrors: e.fields ? [] : [e.message],
      fieldErrors: e.fields,
      hideFields: ['password'],
    });
  logUnexpected('auth', e);
  return submission.reply({ formErrors: ['Something went wrong on our side. Try again.'] });
}

export async function signInAction(_prev: unknown, formData: FormData) {
  const submission = parseWithZod(formData, { schema: formSchemas.signIn });
  if (submission.status !== 'success') return submission.reply({ hideFields: ['password'] });
  try {
    const { session, userId } = await auth.signIn({ ...submission.value, ip: await clientIp() });
    await setSessionCookie(session.id);
    // A company identity waiting for this password sign-in is linked now (and only now).
    const jar = await cookies();
    const link = jar.get(LINK_COOKIE)?.value;
    if (link) {
      await sso.linkPendingIdentity({ userId, linkToken: link });
      jar.delete(LINK_COOKIE);
    }
  } catch (e) {
    return failed(submission, e);
  }
  redirect('/projects');
}

export async function companySignInAction(_prev: unknown, formData: FormData) {
  const submission = parseWithZod(formData, { schema: formSchemas.companySignIn });
  if (submission.status !== 'success') return submission.reply();
  let url: string;
  try {
    const start = await sso.beginSso({ email: submission.value.email });
    (await cookies()).set(
      SSO_COOKIE,
      JSON.stringify({
        state: start.state,
        codeVerifier: start.codeVerifier,
        nonce: start.nonce,
        organizationId: start.organizationId,
      }),
      {
        httpOnly: true,
        sameSite: 'lax',
        secure: env.isProduction(),
        path: '/auth/company',
        maxAge: 600,
      },
    );
    url = start.url;
  } catch (e) {
    return failed(submission, e);
  }
  redirect(url);
}

export async function signUpAction(_prev: unknown, formData: FormData) {
  const submission = parseWithZod(formData, { schema: formSchemas.signUp });
  if (submission.status !== 'success') return submission.reply({ hideFields: ['password'] });
  // Same answer for a new and a known address: the account is created from the mailed link.
  try {
    await auth.requestSignUp(submission.value);
  } catch (e) {
    return failed(submission, e);
  }
  return { ...submission.reply({ resetForm: true }), status: 'success' as const };
}

export async function confirmSignUpAction(_prev: unknown, formData: FormData) {
  const submission = parseWithZod(formData, { schema: formSchemas.token });
  if (submission.status !== 'success') return submission.reply();
  try {
    const { session } = await auth.confirmSignUp(submission.value);
    await setSessionCookie(session.id);
  } catch (e) {
    return failed(submission, e);
  }
  redirect('/projects');
}

/** From the sign-in page after a company sign-in that needs linking: mails a one-time link to the account's address. */
export async function sendLinkMailAction(_prev: unknown, formData: FormData) {
  const submission = parseWithZod(formData, { schema: formSchemas.empty });
  if (submission.status !== 'success') return submission.reply();
  try {
    await sso.sendLinkMail({ linkToken: (await cookies()).get(LINK_COOKIE)?.value });
  } catch (e) {
    return failed(submission, e);
  }
  return { ...submission.reply({ resetForm: true }), status: 'success' as const };
}

/** The mailed linking link, confirmed in the browser that holds the linking cookie. */
export async function linkCompanyAccountAction(_prev: unknown, formData: FormData) {
  const submission = parseWithZod(formData, { schema: formSchemas.token });
  if (submission.status !== 'success') return submission.reply();
  const jar = await cookies();
  try {
    await sso.linkWithMail({ linkToken: jar.get(LINK_COOKIE)?.value, mailToken: submission.value.token });
    jar.delete(LINK_COOKIE);
    jar.set(SSO_MESSAGE_COOKIE, 'Your company account is linked. Sign in with it now.', {
      httpOnly: true,
      sameSite: 'lax',
      path: '/',
      maxAge: 60,
    });
  } catch (e) {
    return failed(submission, e);
  }
  redirect('/sign-in?company=1');
}

/** Anyone holding the domain-proof link mailed to the domain's administrative address may confirm it. */
export async function confirmDomainAction(_prev: unknown, formData: FormData) {
  const submission = parseWithZod(formData, { schema: formSchemas.token });
  if (submission.status !== 'success') return submission.reply();
  try {
    await sso.confirmDomainProof(submission.value.token);
  } catch (e) {
    return failed(submission, e);
  }
  return { ...submission.reply({ resetForm: true }), status: 'success' as const };
}

export async function forgotPasswordAction(_prev: unknown, formData: FormData) {
  const submission = parseWithZod(formData, { schema: formSchemas.forgotPassword });
  if (submission.status !== 'success') return submission.reply();
  try {
    await auth.requestPasswordReset(submission.value);
  } catch (e) {
    return failed(submission, e);
  }
  return { ...submission.reply({ resetForm: true }), status: 'success' as const };
}

export async function resetPasswordAction(_prev: unknown, formData: FormData) {
  const submission = parseWithZod(formData, { schema: formSchemas.resetPassword });
  if (submission.status !== 'success') return submission.reply({ hideFields: ['password'] });
  try {
    await auth.resetPassword(submission.value);
  } catch (e) {
    return failed(submission, e);
  }
  redirect('/sign-in?reset=1');
}

export async function acceptInviteNewAction(_prev: unknown, formData: FormData) {
  const submission = parseWithZod(formData, { schema: formSchemas.acceptInviteNew });
  if (submission.status !== 'success') return submission.reply({ hideFields: ['password'] });
  try {
    const r = await auth.acceptInvitation(submission.value);
    if (r.session) await setSessionCookie(r.session.id);
  } catch (e) {
    return failed(submission, e);
  }
  redirect('/projects');
}

export async function acceptInviteExistingAction(_prev: unknown, formData: FormData) {
  const submission = parseWithZod(formData, { schema: formSchemas.acceptInviteExisting });
  if (submission.status !== 'success') return submission.reply();
  const { user } = await validateRequest();
  if (!user) return submission.reply({ formErrors: ['Sign in first, then open the invitation link again.'] });
  try {
    await auth.acceptInvitation({ token: submission.value.token, userId: user.id });
  } catch (e) {
    return failed(submission, e);
  }
  redirect('/projects');
}

export async function signOutAction() {
  const { session } = await validateRequest();
  if (session) await auth.signOut(session.id);
  await clearSessionCookie();
  redirect('/sign-in');
}
