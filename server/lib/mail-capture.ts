/**
 * A local SMTP server on 127.0.0.1 that keeps every message it receives in memory. It stands in for
 * a hosted mail service in dev (an admin reads the messages at /api/dev/mail) and in tests (which
 * read the invitation and password-reset links back). Mail arrives over real SMTP from nodemailer.
 */
import { randomUUID } from 'node:crypto';
import { EventEmitter } from 'node:events';
import type { AddressInfo } from 'node:net';
import { simpleParser, type AddressObject } from 'mailparser';
import { SMTPServer } from 'smtp-server';

export interface CapturedMail {
  id: string;
  to: string[];
  subject: string;
  text: string;
  html?: string;
  receivedAt: string;
}

export interface MailCapture {
  /** smtp:// URL for nodemailer. */
  url: string;
  port: number;
  /** Messages, oldest first. */
  list(): CapturedMail[];
  waitFor(predicate: (mail: CapturedMail) => boolean, timeoutMs?: number): Promise<CapturedMail>;
  clear(): void;
  close(): Promise<void>;
}

/** Older messages are dropped beyond this, so a long dev session cannot grow without bound. */
const MAX_KEPT_MESSAGES = 500;
const MAX_MESSAGE_BYTES = 5 * 1024 * 1024;
const DEFAULT_WAIT_MS = 10_000;

function addresses(value: AddressObject | AddressObject[] | undefined): string[] {
  const list = Array.isArray(value) ? value : value ? [value] : [];
  return list.flatMap((a) => a.value.map((v) => v.address ?? '').filter(Boolean));
}

export async function startMailCapture(options: { port?: number; host?: string } = {}): Promise<MailCapture> {
  const host = options.host ?? '127.0.0.1';
  const messages: CapturedMail[] = [];
  const events = new EventEmitter();
  events.setMaxListeners(100);

  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['AUTH', 'STARTTLS'],
    size: MAX_MESSAGE_BYTES,
    logger: false,
    banner: 'Fringewalk local mail capture',
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((parsed) => {
          const envelopeTo = session.envelope.rcptTo.map((r) => r.address);
          const mail: CapturedMail = {
            id: randomUUID(),
            to: envelopeTo.length > 0 ? envelopeTo : addresses(parsed.to),
            subject: parsed.subject ?? '',
            text: parsed.text ?? '',
            ...(typeof parsed.html === 'string' ? { html: parsed.html } : {}),
            receivedAt: new Date().toISOString(),
          };
          messages.push(mail);
          if (messages.length > MAX_KEPT_MESSAGES) messages.splice(0, messages.length - MAX_KEPT_MESSAGES);
          events.emit('mail', mail);
          callback();
        })
        .catch((error: Error) => callback(error));
    },
  });

  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 0, host, () => {
      server.off('error', reject);
      resolve();
    });
  });
  // smtp-server keeps its net.Server on `.server`.
  const port = ((server as unknown as { server: { address(): AddressInfo } }).server.address()).port;

  return {
    url: `smtp://${host}:${port}`,
    port,
    list: () => [...messages],
    waitFor(predicate, timeoutMs = DEFAULT_WAIT_MS) {
      const found = messages.find(predicate);
      if (found) return Promise.resolve(found);
      return new Promise((resolve, reject) => {
        const timer = setTimeout(() => {
          events.off('mail', onMail);
          reject(new Error(`No matching e-mail arrived within ${timeoutMs} ms.`));
        }, timeoutMs);
        const onMail = (mail: CapturedMail) => {
          if (!predicate(mail)) return;
          clearTimeout(timer);
          events.off('mail', onMail);
          resolve(mail);
        };
        events.on('mail', onMail);
      });
    },
    clear() {
      messages.length = 0;
    },
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
