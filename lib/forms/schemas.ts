import { z } from 'zod';

/**
 * Form schemas shared by the browser (instant messages) and the server (the real check).
 * Client components look them up by name, because a zod schema cannot cross the server/client boundary.
 */
const email = z
  .string({ error: 'Enter your e-mail address.' })
  .trim()
  .toLowerCase()
  .pipe(z.email({ error: 'Enter a valid e-mail address.' }));
const newPassword = z
  .string({ error: 'Choose a password.' })
  .min(12, { error: 'Use at least 12 characters.' })
  .max(256, { error: 'Use at most 256 characters.' });
const name = z.string({ error: 'Enter your name.' }).trim().min(1, { error: 'Enter your name.' }).max(120);
const role = z.enum(['owner', 'engineer', 'reviewer', 'contractor'], { error: 'Choose a role.' });

export const formSchemas = {
  signIn: z.object({ email, password: z.string({ error: 'Enter your password.' }).min(1) }),
  companySignIn: z.object({ email }),
  signUp: z.object({
    name,
    email,
    password: newPassword,
    organizationName: z
      .string({ error: 'Name your organization.' })
      .trim()
      .min(2, { error: 'Name your organization.' })
      .max(120),
  }),
  forgotPassword: z.object({ email }),
  resetPassword: z.object({ token: z.string().min(10), password: newPassword }),
  acceptInviteNew: z.object({ token: z.string().min(10), name, password: newPassword }),
  acceptInviteExisting: z.object({ token: z.string().min(10) }),
  token: z.object({
    token: z
      .string({ error: 'The link is incomplete; open it from the message again.' })
      .min(10, { error: 'The link is incomplete; open it from the message again.' }),
  }),
  empty: z.object({}),
  changePassword: z.object({
    currentPassword: z
      .string({ error: 'Current password: enter it.' })
      .min(1, { error: 'Current password: enter it.' }),
    newPassword: z
      .string({ error: 'New password: choose one.' })
      .min(12, { error: 'New password: use at least 12 characters.' })
      .max(256, { error: 'New password: use at most 256 characters.' }),
  }),
  domainProof: z.object({
    organizationId: z.uuid({ error: 'The organization is missing; reload the page.' }),
    domain: z
      .string({ error: 'Domain: choose the domain to prove.' })
      .trim()
      .toLowerCase()
      .min(3, { error: 'Domain: choose the domain to prove.' }),
    mailbox: z.enum(['admin', 'administrator', 'hostmaster', 'postmaster', 'webmaster'], {
      error: 'Mailbox: choose one of the administrative addresses.',
    }),
  }),
  membershipRequest: z.object({ organizationId: z.uuid(), userId: z.string().min(1) }),
  invite: z.object({ organizationId: z.uuid(), email, role }),
  changeRole: z.object({ organizationId: z.uuid(), userId: z.string().min(1), role }),
  removeMember: z.object({ organizationId: z.uuid(), userId: z.string().min(1) }),
  createProject: z.object({
    organizationId: z.uuid({ error: 'Choose an organization.' }),
    code: z
      .string({ error: 'Give the project a short code.' })
      .trim()
      .min(2, { error: 'At least 2 characters.' })
      .max(24)
      .regex(/^[A-Za-z0-9._-]+$/, { error: 'Letters, digits, dot, dash and underscore only.' }),
    name: z.string({ error: 'Name the project.' }).trim().min(2).max(160),
    site: z.string().trim().max(160).optional().default(''),
  }),
} as const;

export type FormSchemaName = keyof typeof formSchemas;
