import nodemailer, { type Transporter } from 'nodemailer';
import { env } from '@/lib/env';

let transport: Transporter | undefined;
function getTransport(): Transporter {
  // MAIL_DISABLED=1 (used by the demo seed) builds messages but sends none.
  transport ??=
    process.env.MAIL_DISABLED === '1'
      ? nodemailer.createTransport({ jsonTransport: true })
      : nodemailer.createTransport(env.smtpUrl());
  return transport;
}

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html: string;
}

export async function sendMail(mail: OutgoingMail): Promise<void> {
  await getTransport().sendMail({ from: env.mailFrom(), ...mail });
}

function esc(s: string) {
  return s.replace(
    /[&<>"']/g,
    (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!,
  );
}

/** A plain, readable message layout with one call to action; text and HTML say the same. */
export function composeMail(o: {
  to: string;
  subject: string;
  lines: string[];
  link: { label: string; url: string };
  footer?: string;
}): OutgoingMail {
  const text = [...o.lines, '', `${o.link.label}: ${o.link.url}`, '', o.footer ?? '', '— Lagwise'].join('\n');
  const html = `<!doctype html><html><body style="font-family:system-ui,sans-serif;color:#23282e;max-width:560px">
${o.lines.map((l) => `<p>${esc(l)}</p>`).join('\n')}
<p><a href="${esc(o.link.url)}" style="background:#257a74;color:#fff;padding:8px 14px;border-radius:4px;text-decoration:none">${esc(o.link.label)}</a></p>
<p style="color:#677482;font-size:13px">${esc(o.footer ?? '')}</p><p style="color:#677482;font-size:13px">— Lagwise</p></body></html>`;
  return { to: o.to, subject: o.subject, text, html };
}

/**
 * Sends in the background: the request answers without waiting for SMTP, so a flow that mails in one
 * case and not in another (known or unknown address) takes the same time. Failures are logged.
 */
export function enqueueMail(mail: OutgoingMail): void {
  void sendMail(mail).catch((e) => console.error('[mail] sending failed:', (e as Error).message));
}
