// Reads the project's .env (when there is one) into process.env before anything reads configuration.
// Variables already set in the environment win. The npm scripts load it too (scripts/lib.sh), so this
// matters when the server is started directly; CAGEWRIGHT_DOTENV=off skips it (the test harness).
import { existsSync } from 'node:fs';
import { resolve } from 'node:path';
import { projectRoot } from './config';

export function loadDotEnv(file = resolve(projectRoot, '.env'), env: NodeJS.ProcessEnv = process.env): boolean {
  if (env.CAGEWRIGHT_DOTENV === 'off' || !existsSync(file)) return false;
  process.loadEnvFile(file);
  return true;
}
