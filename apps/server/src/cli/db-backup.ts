import { existsSync } from 'node:fs';
import Database from 'better-sqlite3';
import { describeCheck, runBackup } from '../backups/backup-copy.js';
import { BUSY_TIMEOUT_MS } from '../db/database.js';
import { ConfigError, loadConfig } from '../config/config.js';

/**
 * `pnpm db:backup`: one consistent copy of the database now, while the server runs or not, checked
 * and pruned like the scheduled ones. The copy's path is the last line printed; the exit code is 1
 * when the copy fails its check.
 */
async function main(): Promise<number> {
  if (process.argv.includes('--help')) {
    process.stdout.write('Usage: pnpm db:backup\nCopies DATA_DIR/steadyhand.db into BACKUP_DIR (default DATA_DIR/backups), checks the copy and prints its path last.\n');
    return 0;
  }
  const config = loadConfig();
  if (!existsSync(config.databaseFile)) {
    process.stderr.write(`No database at ${config.databaseFile}: is DATA_DIR right?\n`);
    return 1;
  }
  const source = new Database(config.databaseFile, { fileMustExist: true });
  try {
    source.pragma(`busy_timeout = ${BUSY_TIMEOUT_MS}`);
    const result = await runBackup({ source, dataDir: config.dataDir, backupDir: config.backup.dir, keep: config.backup.keep });
    process.stdout.write(`Copied ${config.databaseFile} (${result.sizeBytes} bytes, ${result.attachmentsCopied} new attachments)\n`);
    process.stdout.write(`Check: ${result.check.ok ? 'passed' : 'FAILED'}: ${describeCheck(result.check)}\n`);
    for (const name of result.removed) process.stdout.write(`Removed the older copy ${name} (BACKUP_KEEP=${config.backup.keep})\n`);
    process.stdout.write(`${result.file}\n`);
    return result.check.ok ? 0 : 1;
  } finally {
    source.close();
  }
}

main().then(
  (code) => process.exit(code),
  (err: unknown) => {
    process.stderr.write((err instanceof ConfigError ? err.message : err instanceof Error ? err.message : String(err)) + '\n');
    process.exit(1);
  },
);
