/**
 * SMTP transport from `delivery.smtp` and classification of SMTP failures into temporary (retry: 4xx replies,
 * timeouts, refused or dropped connections) and permanent (5xx replies, authentication, malformed message).
 */
import nodemailer, { type Transporter } from 'nodemailer';
import type SMTPTransport from 'nodemailer/lib/smtp-transport/index.js';
import type { SmtpConfig } from '../config/service-config.ts';
import { DeliveryError } from '../core/errors.ts';

export type SmtpTransporter = Transporter<SMTPTransport.SentMessageInfo>;

/** The SMTP password from the environment variable named in `smtp.passwordEnv`; undefined without `smtp.user`. */
export function smtpPassword(smtp: SmtpConfig, env: NodeJS.ProcessEnv): string | undefined {
  if (!smtp.user) return undefined;
  if (!smtp.passwordEnv) {
    throw new DeliveryError(
      'delivery.smtp.user is set but delivery.smtp.password-env is not',
      'name the environment variable holding the password in delivery.smtp.password-env of the config YAML',
      false,
    );
  }
  const value = env[smtp.passwordEnv];
  if (value === undefined || value === '') {
    throw new DeliveryError(
      `environment variable ${smtp.passwordEnv} is not set`,
      'export it, or remove delivery.smtp.user from the config YAML',
      false,
    );
  }
  return value;
}

export function createSmtpTransport(smtp: SmtpConfig, env: NodeJS.ProcessEnv = process.env): SmtpTransporter {
  const pass = smtpPassword(smtp, env);
  const timeoutMs = Math.max(1, Math.round(smtp.timeoutSeconds * 1000));
  return nodemailer.createTransport({
    host: smtp.host,
    port: smtp.port,
    secure: smtp.security === 'tls',
    requireTLS: smtp.security === 'starttls',
    ignoreTLS: smtp.security === 'none',
    auth: smtp.user ? { user: smtp.user, pass } : undefined,
    connectionTimeout: timeoutMs,
    greetingTimeout: timeoutMs,
    socketTimeout: timeoutMs,
    dnsTimeout: timeoutMs,
  });
}

/** nodemailer error codes without an SMTP reply that a later attempt may get past. */
const TEMPORARY_CODES = new Set(['ECONNECTION', 'ETIMEDOUT', 'ESOCKET', 'EDNS', 'ECONNREFUSED', 'ECONNRESET', 'EPIPE', 'EPROTOCOL']);

export interface SmtpFailure {
  readonly temporary: boolean;
  /** The login was refused: a configuration problem that affects every message. */
  readonly auth: boolean;
  /** One line: code, SMTP reply code and text. */
  readonly detail: string;
}

/** A send given up (a permanent failure, or the retries spent), with how SMTP failed. */
export class SmtpSendError extends Error {
  constructor(readonly failure: SmtpFailure) {
    super(failure.detail);
  }
}

export function classifySmtpError(err: unknown): SmtpFailure {
  const e = err as { code?: string; responseCode?: number; response?: string; message?: string };
  const text = (e.response ?? e.message ?? String(err)).replace(/\s+/g, ' ').trim();
  const detail = [e.code, e.responseCode, text].filter((x) => x !== undefined && x !== '').join(' ');
  const auth = e.code === 'EAUTH';
  if (typeof e.responseCode === 'number') return { temporary: e.responseCode >= 400 && e.responseCode < 500, auth, detail };
  return { temporary: e.code !== undefined && TEMPORARY_CODES.has(e.code), auth, detail };
}
