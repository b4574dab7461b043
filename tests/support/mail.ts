import type { SinkMessage } from '@/lib/mail/sink-server';

const base = () =>
  process.env.MAIL_SINK_HTTP_URL ?? `http://127.0.0.1:${process.env.MAIL_SINK_HTTP_PORT ?? 2526}`;

/** Waits for the newest message to an address in the local SMTP sink. */
export async function waitForMail(
  to: string,
  opts: { subject?: RegExp; after?: Date; timeoutMs?: number } = {},
): Promise<SinkMessage> {
  const deadline = Date.now() + (opts.timeoutMs ?? 10_000);
  while (Date.now() < deadline) {
    const list: SinkMessage[] = await (await fetch(`${base()}/messages?to=${encodeURIComponent(to)}`)).json();
    const hit = list.find(
      (m) =>
        (!opts.subject || opts.subject.test(m.subject)) &&
        (!opts.after || new Date(m.receivedAt) >= opts.after),
    );
    if (hit) return hit;
    await new Promise((r) => setTimeout(r, 150));
  }
  throw new Error(`no mail to ${to} within the time-out`);
}

export function linkIn(text: string, path: string): string {
  const m = text.match(new RegExp(`https?://\\S+${path}/([A-Za-z0-9_-]+)`));
  if (!m) throw new Error(`no ${path} link in the message`);
  return m[1];
}
