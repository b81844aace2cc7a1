// The outbox dispatcher: every few seconds it claims due messages (FOR UPDATE SKIP LOCKED, so several
// processes never send the same row at once), sends each over SMTP, and marks it sent, or reschedules it
// with capped exponential backoff, or after the last attempt gives it up with the error kept.
// A claim is a lease: a process that dies mid-send leaves rows in `sending` whose lease runs out, and
// they are claimed again (at-least-once; the stable Message-ID lets receivers spot a repeat).
import { createTransport } from 'nodemailer';
import type { DataSource } from 'typeorm';
import { errorFields, type Logger } from '../../logger';
import { afterFailure, defaultBackoff, type BackoffPolicy } from './backoff';

/** The part of a nodemailer transporter the dispatcher uses (tests may pass their own). */
export interface MailTransport {
  sendMail(message: {
    from: string;
    to: string;
    subject: string;
    text: string;
    html?: string;
    messageId: string;
    headers: Record<string, string>;
  }): Promise<unknown>;
  close?(): void;
}

export function createSmtpTransport(smtpUrl: string): MailTransport {
  // Short timeouts: a hanging server must not hold a claimed batch for minutes.
  return createTransport({
    url: smtpUrl,
    connectionTimeout: 5000,
    greetingTimeout: 5000,
    socketTimeout: 15000,
  });
}

export interface OutboxDispatcherOptions {
  dataSource: DataSource;
  transport: MailTransport;
  from: string;
  logger: Logger;
  /** Time between runs; default 5 s. */
  intervalMs?: number;
  batchSize?: number;
  backoff?: BackoffPolicy;
  /** How long a claim holds before another run may take the row again; default 5 min. */
  leaseMs?: number;
  /** The clock (tests move it forward instead of waiting). */
  now?: () => Date;
  /** false: no timer, only runOnce() (tests). */
  autoStart?: boolean;
}

export interface DispatchResult {
  sent: number;
  retried: number;
  gaveUp: number;
}

export interface OutboxDispatcher {
  runOnce(): Promise<DispatchResult>;
  stop(): Promise<void>;
}

interface ClaimedRow {
  id: string;
  to_address: string;
  subject: string;
  text_body: string;
  html_body: string | null;
  kind: string;
  attempts: number;
}

// Wrapped in a SELECT: TypeORM hands back an UPDATE's rows as [rows, count], a SELECT's as rows.
const claimSql = `
  WITH claimed AS (
    UPDATE outbox_messages SET status = 'sending', attempts = attempts + 1, next_attempt_at = $2
    WHERE id IN (
      SELECT id FROM outbox_messages
      WHERE status IN ('pending', 'sending') AND next_attempt_at <= $1
      ORDER BY next_attempt_at, created_at
      LIMIT $3
      FOR UPDATE SKIP LOCKED)
    RETURNING id, to_address, subject, text_body, html_body, kind, attempts)
  SELECT * FROM claimed`;

export function startOutboxDispatcher(options: OutboxDispatcherOptions): OutboxDispatcher {
  const { dataSource: ds, transport, from, logger } = options;
  const now = options.now ?? (() => new Date());
  const backoff = options.backoff ?? defaultBackoff;
  const leaseMs = options.leaseMs ?? 5 * 60_000;
  const batchSize = options.batchSize ?? 10;
  let running: Promise<DispatchResult> | null = null;
  let stopped = false;

  async function sendOne(row: ClaimedRow, result: DispatchResult): Promise<void> {
    try {
      await transport.sendMail({
        from,
        to: row.to_address,
        subject: row.subject,
        text: row.text_body,
        ...(row.html_body ? { html: row.html_body } : {}),
        messageId: `<${row.id}@outbox.cagewright>`,
        headers: { 'X-Cagewright-Kind': row.kind },
      });
      await ds.query(
        `UPDATE outbox_messages SET status = 'sent', sent_at = $2, last_error = NULL WHERE id = $1`,
        [row.id, now()],
      );
      result.sent += 1;
    } catch (err) {
      const message = (err instanceof Error ? err.message : String(err)).slice(0, 2000);
      const decision = afterFailure(row.attempts, backoff);
      if (decision.giveUp) {
        await ds.query(
          `UPDATE outbox_messages SET status = 'failed_permanently', last_error = $2 WHERE id = $1`,
          [row.id, message],
        );
        result.gaveUp += 1;
        logger.error('mail given up', {
          outboxId: row.id,
          kind: row.kind,
          attempts: row.attempts,
          err: message,
        });
      } else {
        const next = new Date(now().getTime() + decision.delayMs);
        await ds.query(
          `UPDATE outbox_messages SET status = 'pending', next_attempt_at = $2, last_error = $3 WHERE id = $1`,
          [row.id, next, message],
        );
        result.retried += 1;
        logger.warn('mail not sent, will retry', {
          outboxId: row.id,
          attempts: row.attempts,
          retryInMs: decision.delayMs,
          err: message,
        });
      }
    }
  }

  async function run(): Promise<DispatchResult> {
    const result: DispatchResult = { sent: 0, retried: 0, gaveUp: 0 };
    const t = now();
    const rows: ClaimedRow[] = await ds.query(claimSql, [t, new Date(t.getTime() + leaseMs), batchSize]);
    // One at a time: mail volume is small, and one SMTP connection is kinder to a relay than ten.
    for (const row of rows) await sendOne(row, result);
    return result;
  }

  function runOnce(): Promise<DispatchResult> {
    running ??= run().finally(() => (running = null));
    return running;
  }

  const timer =
    options.autoStart === false
      ? null
      : setInterval(() => {
          if (stopped || running) return;
          runOnce().catch((err: unknown) =>
            logger.warn('outbox run failed; next run retries', { ...errorFields(err), stack: undefined }),
          );
        }, options.intervalMs ?? 5000);
  timer?.unref();

  return {
    runOnce,
    async stop() {
      stopped = true;
      if (timer) clearInterval(timer);
      await running?.catch(() => undefined);
      transport.close?.();
    },
  };
}
