import 'reflect-metadata';
import { parseArgs } from 'node:util';
import { NestFactory } from '@nestjs/core';
import { roleSchema, textSchema } from '@steadyhand/shared';
import { z } from 'zod';
import { AppModule } from '../app.module.js';
import { ConfigError, loadConfig } from '../config/config.js';
import { openDatabase } from '../db/database.js';
import { assertRecordKeysPresent } from '../records/record-keys.js';
import { databaseHasSignatures } from '../records/signatures.repository.js';
import { UsersService } from '../users/users.service.js';

const USAGE = `Usage: STEADYHAND_PASSWORD=... pnpm user:add --username night.recorder --name "Night Recorder" --roles recorder,leader
The password is read from STEADYHAND_PASSWORD (at least 12 characters), never from the command line.
Roles: recorder, leader, pharmacist, reviewer, admin.`;

const argsSchema = z.object({
  username: textSchema({ message: '--username is required' }),
  name: textSchema({ message: '--name is required' }).trim().min(1, '--name is required').max(120),
  roles: textSchema({ message: '--roles is required' })
    .transform((s) => s.split(',').map((r) => r.trim()).filter(Boolean))
    .pipe(z.array(roleSchema).min(1, 'give at least one role')),
  password: textSchema({ message: 'set STEADYHAND_PASSWORD' }),
});

/** Creates a user with roles: the first admin of a fresh install, or a scripted account. */
async function main(): Promise<number> {
  const { values } = parseArgs({
    options: { username: { type: 'string' }, name: { type: 'string' }, roles: { type: 'string' }, help: { type: 'boolean' } },
    strict: true,
  });
  if (values.help) {
    process.stdout.write(USAGE + '\n');
    return 0;
  }
  const parsed = argsSchema.safeParse({ ...values, password: process.env.STEADYHAND_PASSWORD });
  if (!parsed.success) {
    process.stderr.write(parsed.error.issues.map((i) => i.message).join('\n') + '\n\n' + USAGE + '\n');
    return 2;
  }
  const config = { ...loadConfig(), logLevel: 'silent' as const };
  const database = openDatabase(config.databaseFile, config.migrationsDir);
  try {
    assertRecordKeysPresent(config.dataDir, databaseHasSignatures(database.sqlite));
  } catch (err) {
    database.sqlite.close();
    throw err;
  }
  const ctx = await NestFactory.createApplicationContext(AppModule.forRoot(config, database), { logger: false });
  try {
    const user = await ctx.get(UsersService).create(
      { username: parsed.data.username, displayName: parsed.data.name, password: parsed.data.password, roles: parsed.data.roles },
      { userId: null, username: 'command-line' },
    );
    process.stdout.write(`Created ${user.username} (${user.displayName}) with roles ${user.roles.join(', ')} in ${config.databaseFile}\n`);
    return 0;
  } catch (err) {
    const message = err instanceof z.ZodError ? err.issues.map((i) => i.message).join('; ') : err instanceof Error ? err.message : String(err);
    process.stderr.write(`Could not create the user: ${message}\n`);
    return 1;
  } finally {
    await ctx.close();
  }
}

main().then(
  (code) => process.exit(code),
  (err: unknown) => {
    process.stderr.write((err instanceof ConfigError ? err.message : String(err)) + '\n');
    process.exit(1);
  },
);
