// Prints `export KEY='value'` lines for the variables in the project's .env that the environment does
// not set already (the environment wins, as with Node's own --env-file). lib.sh evals the output so
// that the shell scripts (ports, DATABASE_URL) and every process they start see the same settings.
import { existsSync, readFileSync } from 'node:fs';
import { parseEnv } from 'node:util';

const file = process.argv[2] ?? '.env';
if (process.env.CAGEWRIGHT_DOTENV !== 'off' && existsSync(file)) {
  const quote = (v) => `'${v.replaceAll("'", `'\\''`)}'`;
  for (const [key, value] of Object.entries(parseEnv(readFileSync(file, 'utf8')))) {
    if (!/^[A-Za-z_][A-Za-z0-9_]*$/.test(key)) {
      console.error(`cagewright: ignoring "${key}" in ${file}: not a variable name`);
      continue;
    }
    if (process.env[key] === undefined) console.log(`export ${key}=${quote(value)}`);
  }
}
