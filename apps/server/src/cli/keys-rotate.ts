import { existsSync } from 'node:fs';
import { userInfo } from 'node:os';
import path from 'node:path';
import { parseArgs } from 'node:util';
import Database from 'better-sqlite3';
import { AuditRepository } from '../audit/audit.repository.js';
import { AuditService } from '../audit/audit.service.js';
import { databaseInUse } from '../backups/restore.js';
import { ConfigError, loadConfig } from '../config/config.js';
import { openDatabase } from '../db/database.js';
import { periodText, RECORD_KEY_FILE, rotateRecordKey } from '../records/record-keys.js';

const USAGE = `Usage: pnpm keys:rotate
Makes a new Ed25519 key for the record signatures and printed copies made from now on. The key
signing until now is retired: its public key stays in DATA_DIR/keys/record-signing-public-keys.json
with the period it signed in, so every earlier record keeps verifying; its private key is replaced.
Run it with the server stopped (it refuses while a server uses DATA_DIR), then start the server and
copy DATA_DIR/keys to where the keys are kept (docs/operations.md, "Key rotation").`;

/** The latest time anything was signed or printed, so a clock that stepped back cannot end the old key before it. */
function latestSigned(file: string): string | null {
  const db = new Database(file, { readonly: true, fileMustExist: true });
  try {
    const times = ['SELECT max(signed_at) FROM signatures', 'SELECT max(at) FROM audit_events'].map(
      (sql) => {
        try {
          return db.prepare(sql).pluck().get() as string | null;
        } catch {
          return null; // a database from before these tables: nothing signed
        }
      },
    );
    const latest = Math.max(
      ...times
        .filter((t): t is string => !!t)
        .map((t) => Date.parse(t))
        .filter((t) => !Number.isNaN(t)),
    );
    return Number.isFinite(latest) ? new Date(latest).toISOString() : null;
  } finally {
    db.close();
  }
}

/** Who ran the command, for the audit trail (a system account may have no name). */
function osUser(): string | null {
  try {
    return userInfo().username;
  } catch {
    return process.env.USER ?? null;
  }
}

/** `pnpm keys:rotate`. Exit code 0 rotated, 2 bad arguments, 1 refused (nothing changed). */
function main(): number {
  let help: boolean | undefined;
  try {
    help = parseArgs({ options: { help: { type: 'boolean' } }, strict: true }).values.help;
  } catch (err) {
    process.stderr.write(`${(err as Error).message}\n\n${USAGE}\n`);
    return 2;
  }
  if (help) {
    process.stdout.write(USAGE + '\n');
    return 0;
  }
  const config = loadConfig();
  const hasDatabase = existsSync(config.databaseFile);
  if (hasDatabase && databaseInUse(config.databaseFile)) {
    process.stderr.write(
      `Refused: ${config.databaseFile} is open in another process (a running server, or a backup in progress). ` +
        'A running server keeps signing with the key it read at its start. Stop the server first (for example: systemctl stop steadyhand), rotate, then start it. Nothing was changed.\n',
    );
    return 1;
  }

  const { retired, current, keys, listFile, retiredPrivateKeyFound } = rotateRecordKey(
    config.dataDir,
    {
      notBefore: hasDatabase ? latestSigned(config.databaseFile) : null,
    },
  );
  const keyFile = path.join(config.dataDir, 'keys', RECORD_KEY_FILE);
  if (retired) {
    const old = retiredPrivateKeyFound
      ? 'its private key is replaced by the new one'
      : 'its private key was already missing';
    process.stdout.write(
      `Retired key ${retired.keyId} (signed from ${periodText(retired)}); ${old}.\n`,
    );
  } else {
    process.stdout.write('There was no record signing key yet: made the first one.\n');
  }
  process.stdout.write(
    `New key ${current.keyId} signs from ${current.validFrom} (private key ${keyFile}).\n`,
  );
  process.stdout.write(
    `Public keys kept in ${listFile} (${keys.length}): ${keys.map((k) => k.keyId).join(', ')}. Every earlier record keeps verifying.\n`,
  );

  if (hasDatabase) {
    // In the audit trail beside the signatures, through the database's normal path (migrated first).
    const handle = openDatabase(config.databaseFile, config.migrationsDir);
    try {
      new AuditService(new AuditRepository(handle.db)).record({
        action: 'record-key.rotated',
        userId: null,
        username: 'command-line',
        detail: {
          retiredKeyId: retired?.keyId ?? null,
          keyId: current.keyId,
          at: current.validFrom,
          osUser: osUser(),
        },
      });
    } finally {
      handle.sqlite.close();
    }
  }
  process.stdout.write(
    'Start the server now. Then copy DATA_DIR/keys to where the keys are kept, replacing the earlier copy, and destroy the copies of the retired private key (docs/operations.md, "Key rotation").\n',
  );
  return 0;
}

try {
  process.exit(main());
} catch (err) {
  process.stderr.write(
    (err instanceof ConfigError ? err.message : err instanceof Error ? err.message : String(err)) +
      '\n',
  );
  process.exit(1);
}
