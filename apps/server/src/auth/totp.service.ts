import { createHash, randomBytes } from 'node:crypto';
import { ConflictException, HttpException, HttpStatus, Inject, Injectable, UnauthorizedException } from '@nestjs/common';
import { RECOVERY_CODE_COUNT, type SecondFactorRequest, type TotpEnrolment, type TotpStatus } from '@steadyhand/shared';
import { and, count, eq, gte } from 'drizzle-orm';
import { generateSecret, generateURI, verify } from 'otplib';
import QRCode from 'qrcode';
import { AuditService } from '../audit/audit.service.js';
import { APP_CONFIG } from '../config/config.module.js';
import { readOrCreateSecret, type AppConfig } from '../config/config.js';
import { DB } from '../db/database.module.js';
import type { Db } from '../db/database.js';
import { loginFailures, userTotp } from '../db/schema/index.js';
import { SecretBox } from './secret-box.js';

/** Wrong codes allowed per account in the window before the answer becomes 429. */
export const TOTP_FAILURE_LIMIT = 5;
const TOTP_WINDOW_MS = 15 * 60 * 1000;
const ISSUER = 'Steadyhand';

export type SecondFactorMethod = 'totp' | 'recovery-code';

const hashCode = (code: string) => createHash('sha256').update(code.trim().toLowerCase()).digest('base64url');

/** 12 characters from a 32-letter alphabet (60 bits), grouped for reading aloud: abcd-efgh-jkmn. */
function newRecoveryCode(): string {
  const alphabet = 'abcdefghjkmnpqrstuvwxyz23456789';
  const bytes = randomBytes(12);
  const chars = [...bytes].map((b) => alphabet[b % alphabet.length]).join('');
  return `${chars.slice(0, 4)}-${chars.slice(4, 8)}-${chars.slice(8, 12)}`;
}

/**
 * The second factor: RFC 6238 codes (otplib) from an authenticator app, or single-use recovery
 * codes. Seeds are sealed with a key kept in DATA_DIR/keys; recovery codes are stored as hashes.
 */
@Injectable()
export class TotpService {
  private readonly box: SecretBox;
  /** The last accepted time step per person, so one code cannot be used twice (RFC 6238 §5.2). */
  private readonly lastStep = new Map<string, number>();

  constructor(
    @Inject(DB) private readonly db: Db,
    @Inject(APP_CONFIG) config: AppConfig,
    @Inject(AuditService) private readonly audit: AuditService,
  ) {
    this.box = new SecretBox(readOrCreateSecret(config.dataDir, 'totp-key', () => SecretBox.newKey()));
  }

  private row(userId: string) {
    return this.db.select().from(userTotp).where(eq(userTotp.userId, userId)).get();
  }

  isEnabled(userId: string): boolean {
    return Boolean(this.row(userId)?.enabledAt);
  }

  status(userId: string): TotpStatus {
    const row = this.row(userId);
    const enrolled = Boolean(row?.enabledAt);
    return { enrolled, enabledAt: row?.enabledAt ?? null, recoveryCodesLeft: enrolled ? (row?.recoveryCodes.length ?? 0) : 0 };
  }

  /** A new secret, not yet in force until a code from it is confirmed. */
  async start(user: { id: string; username: string }): Promise<TotpEnrolment> {
    if (this.isEnabled(user.id)) throw new ConflictException('A second factor is already set up for this account; an administrator can reset it');
    const secret = generateSecret();
    const now = new Date().toISOString();
    const values = { secretEncrypted: this.box.seal(secret, user.id), enabledAt: null, recoveryCodes: [], createdAt: now };
    this.db.insert(userTotp).values({ userId: user.id, ...values }).onConflictDoUpdate({ target: userTotp.userId, set: values }).run();
    const otpauthUrl = generateURI({ issuer: ISSUER, label: user.username, secret });
    const qrDataUrl = await QRCode.toDataURL(otpauthUrl, { margin: 2, width: 240, errorCorrectionLevel: 'M' });
    return { secret, otpauthUrl, qrDataUrl };
  }

  /** Turns the second factor on with a first good code; the recovery codes are shown this once. */
  async confirm(user: { id: string; username: string }, code: string, ip: string | undefined): Promise<string[]> {
    const row = this.row(user.id);
    if (!row) throw new ConflictException('Start the set-up first');
    if (row.enabledAt) throw new ConflictException('A second factor is already set up for this account');
    this.assertNotThrottled(user.id);
    if (!(await this.checkCode(user.id, row.secretEncrypted, code))) {
      this.failed(user, ip, 'enrolment');
      throw new HttpException({ statusCode: 400, error: 'Bad Request', message: 'That code does not match; check the time on your phone and try the newest code' }, 400);
    }
    this.clearFailures(user.id);
    const codes = Array.from({ length: RECOVERY_CODE_COUNT }, newRecoveryCode);
    this.db
      .update(userTotp)
      .set({ enabledAt: new Date().toISOString(), recoveryCodes: codes.map(hashCode) })
      .where(eq(userTotp.userId, user.id))
      .run();
    this.audit.record({ action: 'totp.enrolled', userId: user.id, username: user.username, ip: ip ?? null });
    return codes;
  }

  /** Checks a code or a recovery code for a sign-in or a step-up; throws 401 or 429. */
  async verify(user: { id: string; username: string }, input: SecondFactorRequest, ip: string | undefined): Promise<SecondFactorMethod> {
    const row = this.row(user.id);
    if (!row?.enabledAt) throw new ConflictException('No second factor is set up for this account');
    this.assertNotThrottled(user.id);
    if ('code' in input) {
      if (await this.checkCode(user.id, row.secretEncrypted, input.code)) {
        this.clearFailures(user.id);
        return 'totp';
      }
    } else {
      const hash = hashCode(input.recoveryCode);
      if (row.recoveryCodes.includes(hash)) {
        const left = row.recoveryCodes.filter((h) => h !== hash);
        this.db.update(userTotp).set({ recoveryCodes: left }).where(eq(userTotp.userId, user.id)).run();
        this.clearFailures(user.id);
        this.audit.record({ action: 'totp.recovery-code-used', userId: user.id, username: user.username, ip: ip ?? null, detail: { left: left.length } });
        return 'recovery-code';
      }
    }
    this.failed(user, ip, 'code' in input ? 'code' : 'recovery-code');
    throw new UnauthorizedException('That code is not right');
  }

  /** Removes the second factor (an admin helping someone who lost their phone). */
  reset(userId: string): boolean {
    this.lastStep.delete(userId);
    return this.db.delete(userTotp).where(eq(userTotp.userId, userId)).run().changes > 0;
  }

  private async checkCode(userId: string, sealed: string, code: string): Promise<boolean> {
    const secret = this.box.open(sealed, userId);
    // One step either side for phone clocks that drift; a step already used is refused.
    const result = await verify({ secret, token: code, epochTolerance: 30, afterTimeStep: this.lastStep.get(userId) });
    if (!result.valid || !('timeStep' in result)) return false;
    this.lastStep.set(userId, result.timeStep);
    return true;
  }

  // Wrong codes are counted in the same table as failed passwords, under their own key.
  private throttleKey(userId: string): string {
    return `totp:${userId}`;
  }

  private assertNotThrottled(userId: string): void {
    const since = Date.now() - TOTP_WINDOW_MS;
    const where = and(eq(loginFailures.username, this.throttleKey(userId)), gte(loginFailures.at, since));
    const n = this.db.select({ n: count() }).from(loginFailures).where(where).get()?.n ?? 0;
    if (n >= TOTP_FAILURE_LIMIT) {
      throw new HttpException(
        { statusCode: 429, error: 'Too Many Requests', message: 'Too many wrong codes. Wait a while and try again.', retryAfterSeconds: TOTP_WINDOW_MS / 1000 },
        HttpStatus.TOO_MANY_REQUESTS,
      );
    }
  }

  private failed(user: { id: string; username: string }, ip: string | undefined, during: string): void {
    this.db.insert(loginFailures).values({ username: this.throttleKey(user.id), at: Date.now(), ip: ip ?? null }).run();
    this.audit.record({ action: 'auth.second-factor-failed', userId: user.id, username: user.username, ip: ip ?? null, detail: { during } });
  }

  private clearFailures(userId: string): void {
    this.db.delete(loginFailures).where(eq(loginFailures.username, this.throttleKey(userId))).run();
  }
}
