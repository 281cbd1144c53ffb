import nodemailer, { type Transporter } from 'nodemailer';
import { config } from '../config';

export interface SmtpSettings {
  host: string;
  port: number;
  secure: boolean;
  user?: string;
  password?: string;
}

/** SMTP settings from the environment (the local mail catcher in development and tests). */
export function smtpSettings(): SmtpSettings {
  const c = config();
  return { host: c.SMTP_HOST, port: c.SMTP_PORT, secure: c.SMTP_SECURE, user: c.SMTP_USER, password: c.SMTP_PASSWORD };
}

/**
 * A nodemailer transport with short time-outs, so a mail server that is down fails one attempt
 * quickly and the message waits for the next try instead of holding the worker.
 */
export function createTransport(s: SmtpSettings = smtpSettings()): Transporter {
  return nodemailer.createTransport({
    host: s.host,
    port: s.port,
    secure: s.secure,
    // The local catcher speaks plain SMTP; a real relay on 587 upgrades with STARTTLS.
    ignoreTLS: !s.secure && (s.host === '127.0.0.1' || s.host === 'localhost'),
    auth: s.user ? { user: s.user, pass: s.password ?? '' } : undefined,
    connectionTimeout: 5_000,
    greetingTimeout: 5_000,
    socketTimeout: 15_000,
  });
}
