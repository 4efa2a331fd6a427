import { existsSync } from 'node:fs';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { describeCheck } from '../backups/backup-copy.js';
import { restoreCopy } from '../backups/restore.js';
import { ConfigError, loadConfig } from '../config/config.js';

const USAGE = `Usage: pnpm db:restore <file> [--accept-missing-attachments]
Puts a copy made by db:backup (a path, or a name in BACKUP_DIR) in place of DATA_DIR/steadyhand.db.
Refuses while a server uses DATA_DIR; checks the copy first; keeps the replaced database beside it.`;

/** `pnpm db:restore <file>`. Exit code 0 restored, 2 bad arguments, 1 refused (nothing changed). */
async function main(): Promise<number> {
  const { values, positionals } = parseArgs({
    options: { help: { type: 'boolean' }, 'accept-missing-attachments': { type: 'boolean' } },
    allowPositionals: true,
    strict: true,
  });
  if (values.help) {
    process.stdout.write(USAGE + '\n');
    return 0;
  }
  if (positionals.length !== 1) {
    process.stderr.write(`Name one copy to restore.\n\n${USAGE}\n`);
    return 2;
  }
  const config = loadConfig();
  const given = positionals[0]!;
  // Relative to where the command was typed (INIT_CWD under pnpm), else a name in BACKUP_DIR.
  const typed = path.resolve(process.env.INIT_CWD ?? process.cwd(), given);
  const copy = existsSync(typed) ? typed : path.join(config.backup.dir, given);
  const outcome = await restoreCopy({
    copy,
    databaseFile: config.databaseFile,
    dataDir: config.dataDir,
    acceptMissingAttachments: values['accept-missing-attachments'] ?? false,
  });
  if (!outcome.ok) {
    process.stderr.write(`Refused: ${outcome.message}\n`);
    if (outcome.check) process.stderr.write(`Check of the copy: ${describeCheck(outcome.check)}\n`);
    return 1;
  }
  process.stdout.write(`Check of the copy: ${describeCheck(outcome.check)}\n`);
  if (outcome.attachmentsCopied) process.stdout.write(`Brought back ${outcome.attachmentsCopied} attachments into ${path.join(config.dataDir, 'uploads')}\n`);
  if (outcome.keptAs) process.stdout.write(`The replaced database is kept as ${outcome.keptAs}\n`);
  process.stdout.write(`Restored ${outcome.replacedBy} as ${config.databaseFile}\n`);
  process.stdout.write('Start the server now: tablets that still hold entries this copy lacks send them again when they reconnect.\n');
  return 0;
}

main().then(
  (code) => process.exit(code),
  (err: unknown) => {
    process.stderr.write((err instanceof ConfigError ? err.message : err instanceof Error ? err.message : String(err)) + '\n');
    process.exit(1);
  },
);
