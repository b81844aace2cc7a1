// The expiry reminder (queue `cage_record.expiry_reminders`): once an hour, on pg-boss's cron
// schedule, mails the builder of every valid cage record that expires within 30 days and was not
// reminded yet (recordBook.remindExpiring). pg-boss sends one job per hour whichever server fires it;
// should two rounds still meet (a retry, a second server catching up), the record is claimed and
// marked in one statement and the outbox keeps one mail per record's key, so nobody is mailed twice.
// A server that was down catches up at the next hour: the window is "within 30 days", not "on day 30".
import type { Jobs } from '../jobs';
import type { RecordBookService } from '../record-book.service';

export const expiryReminderQueue = 'cage_record.expiry_reminders';
/** Minute 7 of every hour, UTC (off the hour, when other schedules crowd). */
export const expiryReminderCron = '7 * * * *';

export async function registerExpiryReminders(
  jobs: Jobs,
  deps: { recordBook: Pick<RecordBookService, 'remindExpiring'>; now?: () => Date },
  options: { schedule?: boolean } = {},
): Promise<void> {
  await jobs.work(expiryReminderQueue, async (job) => {
    const reminded = await deps.recordBook.remindExpiring(deps.now?.() ?? new Date());
    await job.progress.setTotal(reminded.length);
  });
  if (options.schedule ?? true) await jobs.schedule(expiryReminderQueue, expiryReminderCron);
}
