// The local fake SMTP server for development and tests: accepts any mail on 127.0.0.1 without
// authentication, parses it with mailparser and stores it in dev_mailbox, where the Mailbox page shows
// it. Nothing is relayed anywhere. Started inside server.ts when FAKE_SMTP is on, by the API tests that
// need it, and on its own by `npx tsx backend/src/dev/fake-smtp-cli.ts`.
import { simpleParser, type AddressObject } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import type { Logger } from '../logger';
import type { StoredMail } from '../services/mail';

export interface FakeSmtp {
  host: string;
  port: number;
  stop(): Promise<void>;
}

export interface FakeSmtpOptions {
  /** Where a caught mail goes (the mailbox service's store). */
  store(mail: StoredMail): Promise<unknown>;
  port: number;
  host?: string;
  logger?: Logger;
}

/** Largest message accepted; an outbox mail is a few kB. */
export const fakeSmtpMaxBytes = 5 * 1024 * 1024;

function addresses(value: AddressObject | AddressObject[] | undefined): string | null {
  if (!value) return null;
  const list = Array.isArray(value) ? value : [value];
  return list.map((a) => a.text).join(', ') || null;
}

export function startFakeSmtp(options: FakeSmtpOptions): Promise<FakeSmtp> {
  const host = options.host ?? '127.0.0.1';
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['AUTH', 'STARTTLS'],
    banner: 'Cagewright local fake SMTP (nothing is delivered)',
    size: fakeSmtpMaxBytes,
    logger: false,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then(async (parsed) => {
          const envelopeTo = session.envelope.rcptTo.map((r) => r.address).join(', ');
          const envelopeFrom = session.envelope.mailFrom ? session.envelope.mailFrom.address : '';
          await options.store({
            to: addresses(parsed.to) ?? envelopeTo,
            from: addresses(parsed.from) ?? envelopeFrom,
            subject: parsed.subject ?? '(no subject)',
            text: parsed.text ?? null,
            html: typeof parsed.html === 'string' ? parsed.html : null,
          });
          callback();
        })
        .catch((err: unknown) => {
          // A storage failure is a temporary refusal (4xx), so the sender keeps the mail and retries.
          options.logger?.warn('fake SMTP could not store a mail', {
            err: err instanceof Error ? err.message : String(err),
          });
          callback(Object.assign(new Error('Mailbox unavailable, try again later'), { responseCode: 451 }));
        });
    },
  });
  server.on('error', (err) => options.logger?.warn('fake SMTP error', { err: err.message }));

  return new Promise((resolve, reject) => {
    const onListenError = (err: Error) => reject(err);
    server.server.once('error', onListenError);
    server.listen(options.port, host, () => {
      server.server.off('error', onListenError);
      const address = server.server.address();
      const port = typeof address === 'object' && address ? address.port : options.port;
      options.logger?.info('fake SMTP listening', { host, port });
      resolve({
        host,
        port,
        stop: () => new Promise<void>((done) => server.close(() => done())),
      });
    });
  });
}
