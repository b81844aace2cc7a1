// The fake SMTP server on its own, for a server started with FAKE_SMTP=false or in another process:
//   npx tsx --tsconfig tsconfig.json backend/src/dev/fake-smtp-cli.ts
// Listens on SMTP_URL's port (default 2525) and stores mail in DATABASE_URL's dev_mailbox. Ctrl-C stops it.
import { fakeSmtpDefaultUrl, loadConfig } from '../config';
import { createDataSource } from '../db/data-source';
import { createLogger } from '../logger';
import { createMailboxService } from '../services/mail';
import { startFakeSmtp } from './fake-smtp';

const config = loadConfig();
const logger = createLogger(config.logLevel === 'silent' ? 'info' : config.logLevel);
const ds = createDataSource({ databaseUrl: config.databaseUrl, poolSize: 2, logger });
await ds.initialize();
const port = Number(new URL(config.smtpUrl ?? fakeSmtpDefaultUrl).port);
const smtp = await startFakeSmtp({ store: createMailboxService(ds).store, port, logger });
const stop = async () => {
  await smtp.stop();
  await ds.destroy();
  process.exit(0);
};
process.on('SIGINT', () => void stop());
process.on('SIGTERM', () => void stop());
