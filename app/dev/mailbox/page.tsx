import { notFound } from 'next/navigation';
import { env } from '@/lib/env';
import type { SinkMessage } from '@/lib/mail/sink-server';

export const dynamic = 'force-dynamic';
export const metadata = { title: 'Development mailbox' };

/** Shows what the local SMTP sink received. Off in production unless DEV_MAILBOX=1. */
export default async function MailboxPage() {
  if (!env.devMailboxEnabled()) notFound();
  let messages: SinkMessage[] = [];
  let error = '';
  try {
    const r = await fetch(`${env.mailSinkHttpUrl()}/messages`, { cache: 'no-store' });
    messages = await r.json();
  } catch { error = `The mail sink at ${env.mailSinkHttpUrl()} is not answering. npm start and npm test start it.`; }
  return (
    <main className="mx-auto max-w-4xl px-6 py-8">
      <h1 className="mb-1">Development mailbox</h1>
      <p className="mb-4 text-sm text-ink-600">Every message Lagwise sent to the local SMTP sink. Nothing here left this machine.</p>
      {error ? <p role="alert" className="caution">{error}</p> : null}
      {messages.length === 0 && !error ? <p className="text-sm text-ink-500">No messages yet.</p> : null}
      <ul className="space-y-3">
        {messages.map((m) => (
          <li key={m.id} className="panel p-4">
            <div className="text-xs text-ink-500">{m.receivedAt} · to {m.to.join(', ')}</div>
            <div className="font-medium">{m.subject}</div>
            <div className="mt-2 text-sm" dangerouslySetInnerHTML={{ __html: m.html.replace(/<script[\s\S]*?<\/script>/gi, '') }} />
          </li>
        ))}
      </ul>
    </main>
  );
}
