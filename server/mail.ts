// Outgoing mail through nodemailer: the local capture by default, any SMTP relay by configuration.
import nodemailer from 'nodemailer';
import { readdir, readFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { Env } from './env';

export interface Mailer {
  send: (msg: { to: string; subject: string; text: string }) => Promise<void>;
  check: () => Promise<void>;
  close: () => void;
}

/** A nodemailer transport from the environment. */
export function createMailer(env: Env): Mailer {
  const transport = nodemailer.createTransport({
    host: env.SMTP_HOST,
    port: env.SMTP_PORT,
    secure: env.SMTP_SECURE,
    ignoreTLS: !env.SMTP_SECURE && !env.SMTP_USER,
    auth: env.SMTP_USER ? { user: env.SMTP_USER, pass: env.SMTP_PASSWORD ?? '' } : undefined,
    // A relay that hangs fails the try in seconds, not minutes: the outbox tries again later.
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 30_000,
  });
  return {
    send: async ({ to, subject, text }) => {
      await transport.sendMail({ from: env.MAIL_FROM, to, subject, text });
    },
    check: async () => {
      await transport.verify();
    },
    close: () => transport.close(),
  };
}

export interface CapturedMail {
  id: string;
  at: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string;
}

/** Messages written by the local SMTP capture, newest first. */
export async function readCapturedMail(dir: string): Promise<CapturedMail[]> {
  let names: string[];
  try {
    names = (await readdir(dir)).filter((n) => n.endsWith('.json'));
  } catch {
    return [];
  }
  names.sort().reverse();
  const out: CapturedMail[] = [];
  for (const n of names.slice(0, 200)) {
    out.push(JSON.parse(await readFile(join(dir, n), 'utf8')) as CapturedMail);
  }
  return out;
}
