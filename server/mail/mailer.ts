import nodemailer, { type Transporter } from 'nodemailer';

export interface OutgoingMail {
  to: string | string[];
  subject: string;
  text: string;
  html?: string;
}

export interface Mailer {
  send(mail: OutgoingMail): Promise<void>;
  /** True when the SMTP server answers. */
  verify(): Promise<boolean>;
  transportOptions: Record<string, unknown>;
  close(): void;
}

/**
 * Sends through nodemailer to the SMTP server in SMTP_URL: the local fake in development,
 * a real provider in production. Plain SMTP on loopback does no STARTTLS (stack.md gotcha 11).
 */
export function createMailer(smtpUrl: string, from: string): Mailer {
  const url = new URL(smtpUrl);
  const isLoopback = ['127.0.0.1', 'localhost', '::1', '[::1]'].includes(url.hostname);
  const transportOptions = {
    host: url.hostname,
    port: Number(url.port || (url.protocol === 'smtps:' ? 465 : 587)),
    secure: url.protocol === 'smtps:',
    ignoreTLS: isLoopback,
    ...(url.username ? { auth: { user: decodeURIComponent(url.username), pass: decodeURIComponent(url.password) } } : {}),
    connectionTimeout: 5_000,
    greetingTimeout: 5_000,
  };
  const transporter: Transporter = nodemailer.createTransport(transportOptions);
  return {
    transportOptions,
    async send(mail) {
      await transporter.sendMail({ from, ...mail });
    },
    async verify() {
      try {
        await transporter.verify();
        return true;
      } catch {
        return false;
      }
    },
    close() {
      transporter.close();
    },
  };
}
