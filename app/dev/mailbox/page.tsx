import { notFound } from 'next/navigation';
import { headers } from 'next/headers';
import { env } from '@/lib/env';
import { validateRequest } from '@/lib/auth/session';
import { isLoopbackRequest } from '@/lib/server/client-address';
import type { SinkMessage } from '@/lib/mail/sink-server';

export const dynamic = 'force-dynamic';
export const metadata = { title: 'Development mailbox' };

/**
 * Shows what the local SMTP sink received for the signed-in viewer, and nothing else.
 * Never served by a production build (`next start`): a mailbox that shows other people's
 * reset links is an account takeover. In `next dev` it answers only on loopback and only
 * to a signed-in user, and lists only the mail addressed to that user.
 */
export default async function MailboxPage() {
  if (!env.devMailboxEnabled()) notFound();
  if (!isLoopbackRequest(await headers())) notFound();
  const { user } = await validateRequest();
  if (!user) notFound();
  let messages: SinkMessage[] = [];
  let error = '';
  try {
    const r = await fetch(
      `${env.mailSinkHttpUrl()}/messages?to=${encodeURIComponent(user.email.toLowerCase())}`,
      { cache: 'no-store' },
    );
    messages = await r.json();
  } catch {
    error = `The mail sink at ${env.mailSinkHttpUrl()} is not answering. npm run dev starts it.`;
  }
  return (
    <main className="mx-auto max-w-4xl px-6 py-8">
      <h1 className="mb-1">Development mailbox</h1>
      <p className="mb-4 text-sm text-ink-600">
        Messages Lagwise sent to {user.email} through the local SMTP sink. Nothing here left this machine.
      </p>
      {error ? (
        <p role="alert" className="caution">
          {error}
        </p>
      ) : null}
      {messages.length === 0 && !error ? <p className="text-sm text-ink-500">No messages yet.</p> : null}
      <ul className="space-y-3">
        {messages.map((m) => (
          <li key={m.id} className="panel p-4">
            <div className="text-xs text-ink-500">
              {m.receivedAt} · to {m.to.join(', ')}
            </div>
            <div className="font-medium">{m.subject}</div>
            <pre className="mt-2 whitespace-pre-wrap text-sm">{m.text}</pre>
          </li>
        ))}
      </ul>
    </main>
  );
}
