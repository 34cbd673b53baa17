/**
 * Outgoing e-mail, always over SMTP through nodemailer: a real relay (SMTP_URL) in production, the
 * local capture server (server/lib/mail-capture.ts) in dev and in tests.
 */
import nodemailer from 'nodemailer';

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html?: string;
}

export interface Mailer {
  send(mail: OutgoingMail): Promise<void>;
  close(): void;
}

export function createMailer(options: { smtpUrl: string; from: string }): Mailer {
  const transport = nodemailer.createTransport(options.smtpUrl);
  return {
    async send(mail) {
      await transport.sendMail({ from: options.from, ...mail });
    },
    close() {
      transport.close();
    },
  };
}

/** Escapes text for the small HTML bodies of our e-mails. */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}
