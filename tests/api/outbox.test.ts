// The outbox: mail commits with the caller's transaction, the dispatcher sends it through SMTP, and when
// the SMTP server is down nothing is lost: rows wait with capped exponential backoff and arrive once the
// server is back. After the last attempt a message is given up with its error kept.
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { createLogger } from '../../backend/src/logger';
import { startFakeSmtp, type FakeSmtp } from '../../backend/src/dev/fake-smtp';
import {
  createMailboxService,
  createMailService,
  createSmtpTransport,
  renderMail,
  safetyCaution,
  startOutboxDispatcher,
  type MailTransport,
  type OutboxDispatcher,
} from '../../backend/src/services/mail';
import { useTestDatabase } from './helpers';
import { clearMailTables, freePort, mailboxRows, outboxRows } from './mail-helpers';

const db = useTestDatabase();
const logger = createLogger('silent');
const from = 'Cagewright <no-reply@cagewright.example>';

let port: number;
let smtp: FakeSmtp | null;
let dispatchers: OutboxDispatcher[];

beforeEach(async () => {
  await clearMailTables(db.ds);
  port = await freePort();
  smtp = null;
  dispatchers = [];
});
afterEach(async () => {
  for (const d of dispatchers) await d.stop();
  await smtp?.stop();
});

/** A dispatcher without a timer, on a clock the test moves. */
function dispatcher(
  clock: { t: number },
  transport: MailTransport = createSmtpTransport(`smtp://127.0.0.1:${port}`),
) {
  const d = startOutboxDispatcher({
    dataSource: db.ds,
    transport,
    from,
    logger,
    autoStart: false,
    now: () => new Date(clock.t),
  });
  dispatchers.push(d);
  return d;
}

const startSmtp = async () =>
  (smtp = await startFakeSmtp({ store: createMailboxService(db.ds).store, port }));

const sample = (n: number) => ({
  to: `robin${n}@tarnwick.example`,
  kind: 'test.sample',
  related: { n: String(n) },
  ...renderMail({
    subject: `Verdict changed ${n}`,
    greeting: 'Hello Robin,',
    paragraphs: ['The new edition changes the verdict of your build sheet.'],
    action: { label: 'Open the build sheet', url: 'http://cagewright.test/garage/1' },
  }),
});

describe('mail.enqueue', () => {
  it("commits and rolls back with the caller's transaction", async () => {
    const mail = createMailService(db.ds);
    await expect(
      db.ds.transaction(async (tx) => {
        await mail.enqueue(sample(1), { manager: tx });
        throw new Error('the decision failed');
      }),
    ).rejects.toThrow('the decision failed');
    expect(await outboxRows(db.ds)).toEqual([]);

    await db.ds.transaction(async (tx) => {
      await mail.enqueue(sample(2), { manager: tx });
    });
    const rows = await outboxRows(db.ds);
    expect(rows.map((r) => [r.to_address, r.subject, r.status, r.attempts])).toEqual([
      ['robin2@tarnwick.example', 'Verdict changed 2', 'pending', 0],
    ]);
  });

  it.each([
    [{ ...sample(1), to: 'not-an-address' }, /to: Must be an e-mail address/],
    [{ ...sample(1), subject: '  ' }, /subject: Must not be empty/],
    [{ ...sample(1), kind: 'Shouting' }, /kind: Must look like area.event/],
  ])('refuses a bad mail and stores nothing (%#)', async (bad, message) => {
    await expect(createMailService(db.ds).enqueue(bad)).rejects.toThrow(message);
    expect(await outboxRows(db.ds)).toEqual([]);
  });
});

describe('mail.enqueueMany', () => {
  it('stores a page of mails in one go, each key once, and names the row already there for a known key', async () => {
    const mail = createMailService(db.ds);
    const { id: earlier } = await mail.enqueue(sample(1), { idempotencyKey: 'page:1' });
    const ids = await db.ds.transaction((tx) =>
      mail.enqueueMany(
        [
          { mail: sample(1), idempotencyKey: 'page:1' },
          { mail: sample(2), idempotencyKey: 'page:2' },
          { mail: sample(3), idempotencyKey: 'page:3' },
          // The same key twice in one page is stored once.
          { mail: sample(3), idempotencyKey: 'page:3' },
        ],
        { manager: tx },
      ),
    );
    expect(ids.get('page:1')).toBe(earlier);
    const rows = await outboxRows(db.ds);
    expect(rows.map((r) => r.subject)).toEqual(['Verdict changed 1', 'Verdict changed 2', 'Verdict changed 3']);
    expect([ids.get('page:2'), ids.get('page:3')].sort()).toEqual(rows.filter((r) => r.subject !== 'Verdict changed 1').map((r) => r.id).sort());
    expect(await mail.enqueueMany([])).toEqual(new Map());
  });

  it('refuses the whole page when one mail is bad, and stores none of it', async () => {
    const mail = createMailService(db.ds);
    await expect(mail.enqueueMany([{ mail: sample(1), idempotencyKey: 'a' }, { mail: { ...sample(2), to: 'not-an-address' }, idempotencyKey: 'b' }])).rejects.toThrow(/to: Must be an e-mail address/);
    expect(await outboxRows(db.ds)).toEqual([]);
  });
});

describe('the dispatcher', () => {
  it('keeps mail while SMTP is down and delivers all of it once the server is back', async () => {
    const mail = createMailService(db.ds);
    for (const n of [1, 2, 3]) await mail.enqueue(sample(n));
    const clock = { t: Date.now() };
    const d = dispatcher(clock);

    // Down: every message is tried once and rescheduled 30 s later (the first backoff step).
    expect(await d.runOnce()).toEqual({ sent: 0, retried: 3, gaveUp: 0 });
    let rows = await outboxRows(db.ds);
    expect(rows.map((r) => [r.status, r.attempts])).toEqual([
      ['pending', 1],
      ['pending', 1],
      ['pending', 1],
    ]);
    expect(rows[0]!.last_error).toMatch(/ECONNREFUSED/);
    expect(rows[0]!.next_attempt_at.getTime()).toBe(clock.t + 30_000);

    // Not due yet: a run now claims nothing, even with the server back.
    await startSmtp();
    expect(await d.runOnce()).toEqual({ sent: 0, retried: 0, gaveUp: 0 });

    clock.t += 30_000;
    expect(await d.runOnce()).toEqual({ sent: 3, retried: 0, gaveUp: 0 });
    rows = await outboxRows(db.ds);
    expect(rows.map((r) => [r.status, r.attempts, r.last_error])).toEqual([
      ['sent', 2, null],
      ['sent', 2, null],
      ['sent', 2, null],
    ]);
    const arrived = await mailboxRows(db.ds);
    expect(arrived.map((m) => [m.to_address, m.from_address, m.subject])).toEqual([
      ['robin1@tarnwick.example', '"Cagewright" <no-reply@cagewright.example>', 'Verdict changed 1'],
      ['robin2@tarnwick.example', '"Cagewright" <no-reply@cagewright.example>', 'Verdict changed 2'],
      ['robin3@tarnwick.example', '"Cagewright" <no-reply@cagewright.example>', 'Verdict changed 3'],
    ]);
    expect(arrived[0]!.text_body).toContain('Open the build sheet: http://cagewright.test/garage/1');
    expect(arrived[0]!.text_body).toContain(safetyCaution);
    expect(arrived[0]!.html_body).toContain(
      '<a href="http://cagewright.test/garage/1">Open the build sheet</a>',
    );

    // Sent is final: another run sends nothing twice.
    clock.t += 3_600_000;
    expect(await d.runOnce()).toEqual({ sent: 0, retried: 0, gaveUp: 0 });
    expect(await mailboxRows(db.ds)).toHaveLength(3);
  });

  it('backs off exponentially, then gives up after the last attempt and keeps the error', async () => {
    await createMailService(db.ds).enqueue(sample(1));
    const clock = { t: Date.now() };
    const failing: MailTransport = { sendMail: () => Promise.reject(new Error('550 mailbox unavailable')) };
    const d = startOutboxDispatcher({
      dataSource: db.ds,
      transport: failing,
      from,
      logger,
      autoStart: false,
      now: () => new Date(clock.t),
      backoff: { baseMs: 1000, capMs: 3000, maxAttempts: 4 },
    });
    dispatchers.push(d);

    const waits: number[] = [];
    for (let i = 0; i < 3; i++) {
      expect(await d.runOnce()).toEqual({ sent: 0, retried: 1, gaveUp: 0 });
      const [row] = await outboxRows(db.ds);
      waits.push(row!.next_attempt_at.getTime() - clock.t);
      clock.t = row!.next_attempt_at.getTime();
    }
    expect(waits).toEqual([1000, 2000, 3000]); // doubled, then held at the cap

    expect(await d.runOnce()).toEqual({ sent: 0, retried: 0, gaveUp: 1 });
    const [row] = await outboxRows(db.ds);
    expect([row!.status, row!.attempts, row!.last_error]).toEqual([
      'failed_permanently',
      4,
      '550 mailbox unavailable',
    ]);
    clock.t += 86_400_000;
    expect(await d.runOnce()).toEqual({ sent: 0, retried: 0, gaveUp: 0 });
  });

  it('never sends one row twice when two dispatchers run at once (SKIP LOCKED)', async () => {
    const mail = createMailService(db.ds);
    for (let n = 1; n <= 8; n++) await mail.enqueue(sample(n));
    const sentTo: string[] = [];
    const slow: MailTransport = {
      sendMail: async (m) => {
        await new Promise((r) => setTimeout(r, 20));
        sentTo.push(m.to);
      },
    };
    const clock = { t: Date.now() };
    const results = await Promise.all([dispatcher(clock, slow).runOnce(), dispatcher(clock, slow).runOnce()]);
    expect(results.reduce((n, r) => n + r.sent, 0)).toBe(8);
    expect(sentTo.sort()).toEqual([1, 2, 3, 4, 5, 6, 7, 8].map((n) => `robin${n}@tarnwick.example`).sort());
  });

  it('takes back a row whose sender died mid-send once its claim lapses', async () => {
    const { id } = await createMailService(db.ds).enqueue(sample(1));
    // What a crash leaves behind: claimed (sending), lease ending in the past.
    await db.ds.query(
      `UPDATE outbox_messages SET status = 'sending', attempts = 1, next_attempt_at = now() - interval '1 second' WHERE id = $1`,
      [id],
    );
    await startSmtp();
    expect(await dispatcher({ t: Date.now() }).runOnce()).toEqual({ sent: 1, retried: 0, gaveUp: 0 });
    expect((await outboxRows(db.ds)).map((r) => [r.status, r.attempts])).toEqual([['sent', 2]]);
  });

  it('sends on its own timer and stops when told', async () => {
    await startSmtp();
    const d = startOutboxDispatcher({
      dataSource: db.ds,
      transport: createSmtpTransport(`smtp://127.0.0.1:${port}`),
      from,
      logger,
      intervalMs: 50,
    });
    dispatchers.push(d);
    await createMailService(db.ds).enqueue(sample(1));
    const deadline = Date.now() + 5000;
    while ((await mailboxRows(db.ds)).length === 0 && Date.now() < deadline)
      await new Promise((r) => setTimeout(r, 50));
    expect((await mailboxRows(db.ds)).map((m) => m.subject)).toEqual(['Verdict changed 1']);

    await d.stop();
    await createMailService(db.ds).enqueue(sample(2));
    await new Promise((r) => setTimeout(r, 300));
    expect((await outboxRows(db.ds)).map((r) => r.status)).toEqual(['sent', 'pending']);
  });
});
