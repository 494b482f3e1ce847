/**
 * The local e-mail fake: an SMTP server on loopback that stores every message it receives
 * in outbox_messages, for the admin outbox page and for tests. Development and tests only.
 */
import { simpleParser } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import { type Database, isDatabaseUnavailable } from '../db/client';
import { outboxMessages } from '../db/schema';
import { logger } from '../lib/logger';

export interface SmtpFake {
  port: number;
  stop(): Promise<void>;
}

export async function startSmtpFake(db: Database, port: number, host = '127.0.0.1'): Promise<SmtpFake> {
  const server = new SMTPServer({
    // The bundled STARTTLS certificate has expired and AUTH is not needed on loopback (stack.md gotcha 11).
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    logger: false,
    size: 10 * 1024 * 1024,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('error', callback);
      stream.on('end', async () => {
        try {
          const raw = Buffer.concat(chunks).toString('utf8');
          const parsed = await simpleParser(raw);
          await db.insert(outboxMessages).values({
            envelopeFrom: session.envelope.mailFrom ? session.envelope.mailFrom.address : null,
            envelopeTo: session.envelope.rcptTo.map((r) => r.address),
            subject: parsed.subject ?? null,
            textBody: parsed.text ?? null,
            htmlBody: typeof parsed.html === 'string' ? parsed.html : null,
            raw,
          });
          callback();
        } catch (err) {
          // A database outage is temporary: 451 tells the sender to try again later (RFC 5321 §4.2.5),
          // so alert e-mails are retried rather than lost. The error never reaches the process.
          const temporary = isDatabaseUnavailable(err);
          logger[temporary ? 'warn' : 'error']({ err }, 'smtp fake could not store a message');
          callback(Object.assign(new Error(temporary ? 'Mailbox store unavailable, try again later' : (err as Error).message), { responseCode: temporary ? 451 : 554 }));
        }
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, host, () => {
      server.off('error', reject);
      resolve();
    });
  });
  const address = server.server.address();
  const actualPort = typeof address === 'object' && address ? address.port : port;
  return {
    port: actualPort,
    stop: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
