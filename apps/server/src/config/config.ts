import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { isIP } from 'node:net';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { z } from 'zod';

/** The repository root, the same from src/ (tests) and dist/ (production). */
export const REPO_ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../../..');

const boolFromEnv = z
  .enum(['1', '0', 'true', 'false', 'yes', 'no', ''])
  .transform((v) => v === '1' || v === 'true' || v === 'yes');

const envSchema = z.object({
  PORT: z.coerce.number().int().min(0).max(65535).default(3000),
  /** Address to listen on; unset listens on every interface (tablets reach the server over the ward network). */
  HOST: z.string().optional(),
  DATA_DIR: z.string().min(1).default('./data'),
  /** The address people type; decides secure cookies and the allowed Origins. */
  PUBLIC_ORIGIN: z.url().optional(),
  /** Extra Origins allowed to open the live socket and send state-changing requests, comma separated. */
  ALLOWED_ORIGINS: z.string().default(''),
  STEADYHAND_DEMO: boolFromEnv.default(false),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
  SESSION_IDLE_MINUTES: z.coerce.number().int().min(1).max(24 * 60).default(30),
  SESSION_ABSOLUTE_HOURS: z.coerce.number().int().min(1).max(72).default(12),
  /** Failed sign-ins allowed per account in a rolling hour. */
  LOGIN_ACCOUNT_LIMIT: z.coerce.number().int().min(1).max(1000).default(100),
  /** Failed sign-ins allowed per client address in 15 minutes. */
  LOGIN_IP_LIMIT: z.coerce.number().int().min(1).max(10000).default(50),
  TRUST_PROXY: boolFromEnv.default(false),
  WEB_DIST: z.string().optional(),
  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: z.coerce.number().int().min(0).max(65535).default(2525),
  /** Runs the local fake mail relay inside the server on 127.0.0.1:SMTP_PORT (development and tests). */
  FAKE_SMTP: boolFromEnv.default(false),
  PHARMACY_EMAIL: z.string().min(3).default('pharmacy@harbourview.example'),
  REVIEWERS_EMAIL: z.string().min(3).default('resus-committee@harbourview.example'),
  MAIL_FROM: z.string().min(3).default('Steadyhand <steadyhand@harbourview.example>'),
  /** Largest attachment accepted, in megabytes (fractions allowed). */
  ATTACHMENT_MAX_MB: z.coerce.number().positive().max(1024).default(15),
  /** Where the database copies go; default DATA_DIR/backups. */
  BACKUP_DIR: z.string().min(1).optional(),
  /** Minutes between copies while the server runs; 0 turns the schedule off. */
  BACKUP_INTERVAL_MINUTES: z.coerce.number().int().min(0).max(7 * 24 * 60).default(15),
  /** How many copies to keep (96 = a day at the default interval). */
  BACKUP_KEEP: z.coerce.number().int().min(1).max(100_000).default(96),
  /** Addresses (or CIDR ranges) that may read /metrics, comma separated. */
  METRICS_ALLOW: z.string().default('127.0.0.1,::1'),
});

export interface AppConfig {
  port: number;
  host: string | undefined;
  dataDir: string;
  databaseFile: string;
  publicOrigin: string;
  allowedOrigins: string[];
  secureCookies: boolean;
  demo: boolean;
  logLevel: z.infer<typeof envSchema>['LOG_LEVEL'];
  sessionIdleMs: number;
  sessionAbsoluteMs: number;
  loginAccountLimit: number;
  loginIpLimit: number;
  trustProxy: boolean;
  webDist: string;
  migrationsDir: string;
  sessionSecret: string;
  smtp: { host: string; port: number };
  /** The fake relay listens on smtp.port and the mail transport follows it (port 0 picks a free one). */
  fakeSmtp: boolean;
  mail: { from: string; pharmacy: string; reviewers: string };
  attachmentMaxBytes: number;
  backup: { dir: string; intervalMinutes: number; keep: number };
  /** Parsed METRICS_ALLOW: exact addresses and CIDR ranges. */
  metricsAllow: string[];
}

export class ConfigError extends Error {}

/** Reads and checks the environment; a bad value stops the start with a message naming it. */
export function loadConfig(env: NodeJS.ProcessEnv = process.env): AppConfig {
  const parsed = envSchema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`);
    throw new ConfigError(`Invalid configuration:\n  ${lines.join('\n  ')}`);
  }
  const e = parsed.data;
  // Relative paths are taken from where the command was typed (INIT_CWD under npm and pnpm).
  const baseDir = env.INIT_CWD ?? process.cwd();
  const dataDir = path.resolve(baseDir, e.DATA_DIR);
  mkdirSync(dataDir, { recursive: true, mode: 0o700 });
  const publicOrigin = (e.PUBLIC_ORIGIN ?? `http://localhost:${e.PORT}`).replace(/\/$/, '');
  const extra = e.ALLOWED_ORIGINS.split(',').map((s) => s.trim().replace(/\/$/, '')).filter(Boolean);
  const port = e.PORT;
  const allowedOrigins = [
    ...new Set([publicOrigin, `http://localhost:${port}`, `http://127.0.0.1:${port}`, ...extra]),
  ];
  return {
    port,
    host: e.HOST,
    dataDir,
    databaseFile: path.join(dataDir, 'steadyhand.db'),
    publicOrigin,
    allowedOrigins,
    secureCookies: publicOrigin.startsWith('https://'),
    demo: e.STEADYHAND_DEMO,
    logLevel: e.LOG_LEVEL,
    sessionIdleMs: e.SESSION_IDLE_MINUTES * 60_000,
    sessionAbsoluteMs: e.SESSION_ABSOLUTE_HOURS * 3_600_000,
    loginAccountLimit: e.LOGIN_ACCOUNT_LIMIT,
    loginIpLimit: e.LOGIN_IP_LIMIT,
    trustProxy: e.TRUST_PROXY,
    webDist: path.resolve(e.WEB_DIST ?? path.join(REPO_ROOT, 'apps/web/dist')),
    migrationsDir: path.join(REPO_ROOT, 'drizzle'),
    sessionSecret: readOrCreateSecret(dataDir, 'session-secret', () => randomBytes(48).toString('base64url')),
    smtp: { host: e.SMTP_HOST, port: e.SMTP_PORT },
    fakeSmtp: e.FAKE_SMTP,
    mail: { from: e.MAIL_FROM, pharmacy: e.PHARMACY_EMAIL, reviewers: e.REVIEWERS_EMAIL },
    attachmentMaxBytes: Math.floor(e.ATTACHMENT_MAX_MB * 1024 * 1024),
    backup: {
      dir: path.resolve(baseDir, e.BACKUP_DIR ?? path.join(dataDir, 'backups')),
      intervalMinutes: e.BACKUP_INTERVAL_MINUTES,
      keep: e.BACKUP_KEEP,
    },
    metricsAllow: parseAllowList(e.METRICS_ALLOW),
  };
}

/**
 * METRICS_ALLOW as a list of addresses and CIDR ranges; a word that is neither stops the start,
 * so a typo never opens (or silently closes) the metrics.
 */
export function parseAllowList(text: string): string[] {
  const items = text.split(',').map((s) => s.trim()).filter(Boolean);
  for (const item of items) {
    const [address, bits, extra] = item.split('/');
    const family = address ? isIP(address) : 0;
    const bitsOk = bits === undefined || (/^\d{1,3}$/.test(bits) && Number(bits) <= (family === 6 ? 128 : 32));
    if (!family || !bitsOk || extra !== undefined) {
      throw new ConfigError(`Invalid configuration:\n  METRICS_ALLOW: "${item}" is not an IP address or a CIDR range (e.g. 127.0.0.1, 10.20.0.0/16, ::1)`);
    }
  }
  return items;
}

/**
 * Secrets are made on first start and kept in the data folder (mode 600), never in the
 * repository, so each installation has its own.
 */
export function readOrCreateSecret(dataDir: string, name: string, make: () => string): string {
  const keysDir = path.join(dataDir, 'keys');
  mkdirSync(keysDir, { recursive: true, mode: 0o700 });
  const file = path.join(keysDir, name);
  if (existsSync(file)) return readFileSync(file, 'utf8').trim();
  const value = make();
  writeFileSync(file, value + '\n', { mode: 0o600, flag: 'wx' });
  return value;
}
