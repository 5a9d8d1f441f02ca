// The SMTP capture for local use and tests: accepts every message on 127.0.0.1 and writes it, parsed,
// as one JSON file per message into a folder that the mailbox page and the tests read.
import { mkdirSync, writeFileSync, renameSync } from 'node:fs';
import { join } from 'node:path';
import { randomUUID } from 'node:crypto';
import { SMTPServer } from 'smtp-server';
import { simpleParser } from 'mailparser';

export interface SmtpCaptureHandle {
  stop: () => Promise<void>;
}

/** Starts the capture on `port`, writing `<time>-<id>.json` files into `dir`. */
export async function startSmtpCapture(opts: { dir: string; port: number }): Promise<SmtpCaptureHandle> {
  mkdirSync(opts.dir, { recursive: true });
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['AUTH', 'STARTTLS'],
    logger: false,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((mail) => {
          const id = `${Date.now().toString().padStart(15, '0')}-${randomUUID()}`;
          const record = {
            id,
            at: new Date().toISOString(),
            from: mail.from?.text ?? session.envelope.mailFrom?.toString() ?? '',
            to: session.envelope.rcptTo.map((r) => r.address),
            subject: mail.subject ?? '',
            text: mail.text ?? '',
            html: typeof mail.html === 'string' ? mail.html : '',
          };
          // Write then rename, so a reader never sees half a file.
          const tmp = join(opts.dir, `.${id}.tmp`);
          writeFileSync(tmp, JSON.stringify(record));
          renameSync(tmp, join(opts.dir, `${id}.json`));
          callback();
        })
        .catch((e: Error) => callback(e));
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(opts.port, '127.0.0.1', () => resolve());
  });
  server.removeAllListeners('error');
  // A client that drops its connection mid-session (a mailer timing out on a busy machine, a test
  // stopping SMTP use) is that connection's end, not the capture's: without a listener the error
  // event would end the whole services process.
  server.on('error', (e: NodeJS.ErrnoException) => {
    if (e.code !== 'ECONNRESET' && e.code !== 'EPIPE') console.error(`smtp capture: ${e.message}`);
  });
  return { stop: () => new Promise<void>((resolve) => server.close(() => resolve())) };
}
