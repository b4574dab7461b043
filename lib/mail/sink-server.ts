/**
 * Local SMTP sink for development and tests: accepts every message on 127.0.0.1, keeps it
 * (in memory and in a JSON-lines file so a restart keeps the mailbox) and lists them over HTTP:
 *   GET /messages            newest first, optional ?to=address
 *   DELETE /messages         empty the mailbox
 * Nothing is relayed anywhere.
 */
import { SMTPServer } from 'smtp-server';
import { simpleParser } from 'mailparser';
import { createServer } from 'node:http';
import { appendFileSync, mkdirSync, readFileSync, writeFileSync, existsSync } from 'node:fs';
import { dirname } from 'node:path';
import { randomUUID } from 'node:crypto';

export interface SinkMessage {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string;
}

const smtpPort = Number(process.env.MAIL_SINK_SMTP_PORT ?? 2525);
const httpPort = Number(process.env.MAIL_SINK_HTTP_PORT ?? 2526);
const file = process.env.MAIL_SINK_FILE ?? '.data/mail/messages.jsonl';

mkdirSync(dirname(file), { recursive: true });
const messages: SinkMessage[] = existsSync(file)
  ? readFileSync(file, 'utf8')
      .split('\n')
      .filter(Boolean)
      .map((l) => JSON.parse(l))
  : [];

const smtp = new SMTPServer({
  authOptional: true,
  disabledCommands: ['STARTTLS'],
  logger: false,
  size: 10 * 1024 * 1024,
  onData(stream, session, callback) {
    simpleParser(stream)
      .then((parsed) => {
        const msg: SinkMessage = {
          id: randomUUID(),
          receivedAt: new Date().toISOString(),
          from: parsed.from?.text ?? '',
          to: session.envelope.rcptTo.map((r) => r.address.toLowerCase()),
          subject: parsed.subject ?? '',
          text: parsed.text ?? '',
          html: typeof parsed.html === 'string' ? parsed.html : '',
        };
        messages.push(msg);
        appendFileSync(file, `${JSON.stringify(msg)}\n`);
        callback();
      })
      .catch((e) => callback(e));
  },
});

const http = createServer((req, res) => {
  const url = new URL(req.url ?? '/', 'http://x');
  if (url.pathname === '/health') {
    res.end('ok');
    return;
  }
  if (url.pathname !== '/messages') {
    res.statusCode = 404;
    res.end();
    return;
  }
  if (req.method === 'DELETE') {
    messages.length = 0;
    writeFileSync(file, '');
    res.statusCode = 204;
    res.end();
    return;
  }
  const to = url.searchParams.get('to')?.toLowerCase();
  const list = messages
    .filter((m) => !to || m.to.includes(to))
    .slice()
    .reverse();
  res.setHeader('content-type', 'application/json');
  res.end(JSON.stringify(list));
});

smtp.on('error', (e) => {
  console.error('[mail] smtp error', e.message);
});
smtp.listen(smtpPort, '127.0.0.1', () => {
  http.listen(httpPort, '127.0.0.1', () => {
    console.error(`[mail] sink: SMTP 127.0.0.1:${smtpPort}, mailbox http://127.0.0.1:${httpPort}/messages`);
  });
});

for (const sig of ['SIGTERM', 'SIGINT'] as const) {
  process.on(sig, () => {
    smtp.close(() => process.exit(0));
    http.close();
    setTimeout(() => process.exit(0), 500).unref();
  });
}
