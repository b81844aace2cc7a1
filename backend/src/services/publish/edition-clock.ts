// The edition clock: brings scheduled rulebook editions into force when their date comes (midnight in
// the club's time zone). It asks once at start-up and then every `everyMs` (a minute by default), so
// an edition is in force within a minute of its date wherever the club is, and a server that was
// down over midnight catches up as it starts. The work itself (rulebookAdmin.activateDueEditions)
// locks each rulebook and is idempotent, so several servers may run the clock at once.
import { errorFields, type Logger } from '../../logger';
import type { ActivatedEdition } from '../rulebook-admin.service';

export interface EditionClock {
  /** Runs one round now (tests and start-up); resolves with what came into force. */
  tick(): Promise<ActivatedEdition[]>;
  stop(): void;
}

export function startEditionClock(
  activate: () => Promise<ActivatedEdition[]>,
  logger: Logger,
  options: { everyMs?: number } = {},
): EditionClock {
  let running: Promise<ActivatedEdition[]> | null = null;
  async function tick(): Promise<ActivatedEdition[]> {
    // One round at a time in this process; a slow round is not stacked on.
    if (running) return running;
    running = (async () => {
      try {
        const done = await activate();
        for (const e of done) logger.info('edition in force', { versionId: e.versionId, rulebookId: e.rulebookId, versionNumber: e.versionNumber });
        return done;
      } catch (err) {
        logger.warn('edition clock: could not bring editions into force; the next round tries again', { ...errorFields(err), stack: undefined });
        return [];
      } finally {
        running = null;
      }
    })();
    return running;
  }
  void tick();
  const timer = setInterval(() => void tick(), options.everyMs ?? 60_000);
  timer.unref();
  return { tick, stop: () => clearInterval(timer) };
}
