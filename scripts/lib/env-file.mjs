// Prints the settings of a dotenv file as NUL-separated KEY and VALUE, parsed by Node's own
// dotenv parser (util.parseEnv — the one behind process.loadEnvFile and `node --env-file`), so
// the shell scripts (scripts/lib/common.sh load_env_file), the database scripts (db/migrate.ts)
// and the app read `.env` alike. Usage: node scripts/lib/env-file.mjs FILE
import { readFileSync } from "node:fs";
import { parseEnv } from "node:util";

const file = process.argv[2];
if (!file) {
  console.error("usage: node scripts/lib/env-file.mjs FILE");
  process.exit(2);
}
let text;
try {
  text = readFileSync(file, "utf8");
} catch (e) {
  console.error(`cannot read ${file}: ${e instanceof Error ? e.message : e}`);
  process.exit(1);
}
for (const [key, value] of Object.entries(parseEnv(text))) process.stdout.write(`${key}\0${value}\0`);
