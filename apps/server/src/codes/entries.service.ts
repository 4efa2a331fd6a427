import { BadRequestException, ConflictException, ForbiddenException, Inject, Injectable, NotFoundException, Optional } from '@nestjs/common';
import {
  amendEntry,
  effectiveEntries,
  hasAnyRole,
  liveEntries,
  unchangedFields,
  WRITER_ROLES,
  type ClinicalEntry,
  type NewEntry,
  type RefillInfo,
  type StoredEntry,
} from '@steadyhand/shared';
import { AuditService } from '../audit/audit.service.js';
import type { SessionUser } from '../auth/session-user.js';
import { MetricsService } from '../metrics/metrics.service.js';
import { CodesRepository } from './codes.repository.js';
import { EntryEvents } from './entry-events.js';

export interface AddEntryResult {
  entry: StoredEntry;
  /** True when this id was stored before: the same tap sent again. */
  duplicate: boolean;
}

/**
 * The one way an entry gets into the log, shared by the REST route and the live socket:
 * check, commit, then tell the other screens.
 */
@Injectable()
export class EntriesService {
  constructor(
    @Inject(CodesRepository) private readonly repo: CodesRepository,
    @Inject(EntryEvents) private readonly events: EntryEvents,
    @Inject(AuditService) private readonly audit: AuditService,
    @Optional() @Inject(MetricsService) private readonly metrics?: MetricsService,
  ) {}

  /**
   * `addendum`: the entry is added to a signed record after the fact. Plain entries are refused
   * once the record carries a signature, and addenda before it, so the signed log only grows by
   * entries marked as added later.
   *
   * `refill`: a device sends back an entry the server had acknowledged once but no longer holds
   * (restored from an older copy). It is stored like any entry (its device time kept, received and
   * recorded now, chained after what the log holds), as an addendum if the record was signed
   * meanwhile, and the audit trail says it came back from a device.
   */
  add(
    user: SessionUser,
    codeId: string,
    entry: NewEntry,
    receivedAt = new Date().toISOString(),
    options: { addendum?: boolean; refill?: RefillInfo } = {},
  ): AddEntryResult {
    const refill = options.refill;
    if (!hasAnyRole(user.roles, WRITER_ROLES)) {
      throw new ForbiddenException('Only a recorder or a team leader can add entries');
    }
    const statusBefore = this.repo.codeStatus(codeId);
    if (!statusBefore) throw new NotFoundException(`No code with id ${codeId}`);

    // A resend of a tap stored earlier gets its stored row back, signed record or not, so an
    // outbox never loops on an entry that did land.
    const earlier = this.repo.findEntry(entry.id);
    if (earlier) {
      if (earlier.codeId !== codeId) throw new ConflictException(`Entry ${entry.id} belongs to another code`);
      this.metrics?.resends.inc();
      return { entry: earlier, duplicate: true };
    }
    const signed = this.repo.isSigned(codeId);
    const addendum = options.addendum ?? (refill !== undefined && signed);
    if (signed && !addendum) throw new ConflictException('This record is signed: add an addendum');
    if (!signed && addendum) throw new ConflictException('This record is not signed yet: add a plain entry, not an addendum');
    const target = entry.kind === 'void' || entry.kind === 'amend' ? this.checkCorrection(codeId, entry) : undefined;
    const endTouched = entry.kind === 'end' || target?.kind === 'end';
    // The signed code row (status, end time, outcome) stays as signed; the log shows the addendum.
    if (addendum && entry.kind === 'void' && target?.kind === 'end') {
      throw new ConflictException('A signed record stays ended: amend the end entry or add a note instead of voiding it');
    }

    // The writer's name as it is now goes with the entry: a later rename changes nothing in the record.
    const result = this.repo.appendEntry(entry, { codeId, userId: user.id, userName: user.displayName, receivedAt, addendum }, () => {
      if (!addendum && endTouched) this.syncCodeStatus(codeId);
    });
    if (!result.duplicate) {
      this.metrics?.entryCommitted(result.entry, refill !== undefined);
      if (refill) this.auditRefill(user, codeId, result.entry, refill);
      this.auditEntry(user, codeId, entry, target, addendum);
      const codeStatus = !addendum && endTouched ? (this.repo.codeStatus(codeId) ?? statusBefore) : statusBefore;
      this.events.emitAdded({ codeId, entry: result.entry, cursor: result.entry.cursor }, { codeStatus });
      if (!addendum && endTouched) this.events.emitCodesChanged(codeId);
    }
    return result;
  }

  private auditRefill(user: SessionUser, codeId: string, stored: StoredEntry, refill: RefillInfo): void {
    this.audit.record({
      action: 'entry.refilled',
      userId: user.id,
      username: user.username,
      codeId,
      detail: {
        entryId: stored.id,
        kind: stored.kind,
        deviceId: stored.deviceId ?? null,
        seq: stored.seq ?? null,
        at: stored.at,
        addendum: stored.addendum,
        // As the device was told when the server first stored it (before the restore).
        firstStoredAt: refill.storedAt ?? null,
        firstStoredBy: refill.storedBy ?? null,
      },
    });
  }

  /** Corrections and addenda go to the audit trail with who, the old and new values and the reason. */
  private auditEntry(user: SessionUser, codeId: string, entry: NewEntry, target: StoredEntry | undefined, addendum: boolean): void {
    if (entry.kind === 'void' || entry.kind === 'amend') {
      const old = target && entry.kind === 'amend'
        ? Object.fromEntries(Object.keys(entry.changes).map((k) => [k, (target as Record<string, unknown>)[k] ?? null]))
        : (target ?? null);
      this.audit.record({
        action: entry.kind === 'void' ? 'entry.voided' : 'entry.amended',
        userId: user.id,
        username: user.username,
        codeId,
        detail: {
          entryId: entry.id,
          target: entry.target,
          reason: entry.reason,
          addendum,
          old,
          new: entry.kind === 'amend' ? entry.changes : null,
          ...(entry.kind === 'amend' ? { changes: entry.changes } : {}),
        },
      });
    } else if (addendum) {
      this.audit.record({
        action: 'record.addendum',
        userId: user.id,
        username: user.username,
        codeId,
        detail: { entryId: entry.id, kind: entry.kind, old: null, new: entry },
      });
    }
  }

  /** The entries after a cursor, and how many the log holds in all (a screen checks its copy with it). */
  entriesAfter(codeId: string, afterCursor = 0): { entries: StoredEntry[]; cursor: number; count: number } {
    if (!this.repo.codeStatus(codeId)) throw new NotFoundException(`No code with id ${codeId}`);
    const list = this.repo.entriesOf(codeId, afterCursor);
    return { entries: list, cursor: list.length ? list[list.length - 1]!.cursor : afterCursor, count: this.repo.entryCount(codeId) };
  }

  /** What a device compares with the entries it keeps: the ids in the log, and whether the record is signed. */
  logIds(codeId: string): { exists: false } | { exists: true; ids: string[]; signed: boolean } {
    if (!this.repo.codeStatus(codeId)) return { exists: false };
    return { exists: true, ids: this.repo.entryIdsOf(codeId), signed: this.repo.isSigned(codeId) };
  }

  /**
   * A void or amend must point at an entry of the same code, and an amendment must leave a valid
   * entry. Returns the target.
   */
  private checkCorrection(codeId: string, entry: Extract<NewEntry, { kind: 'void' | 'amend' }>): StoredEntry {
    const target = this.repo.findEntry(entry.target);
    if (!target || target.codeId !== codeId) throw new BadRequestException(`target ${entry.target} is not an entry of this code`);
    if (target.kind === 'void') throw new BadRequestException('A void cannot be voided or amended; add a new entry instead');
    if (entry.kind === 'amend') {
      if (target.kind === 'amend') throw new BadRequestException('Amend the original entry, not an amendment');
      // Checked against the entry as it reads now (earlier corrections applied), as the record shows it.
      const current = this.currentEntry(codeId, target.id) ?? (target);
      const result = amendEntry(current, entry.changes);
      if (!result.ok) throw new BadRequestException(`The amendment would leave an invalid entry: ${result.error}`);
      const same = unchangedFields(current, entry.changes);
      if (same.length) {
        const now = current as Record<string, unknown>;
        throw new BadRequestException(`The amendment changes nothing: ${same.map((f) => `${f} is already ${JSON.stringify(now[f])}`).join('; ')}`);
      }
    }
    return target;
  }

  /** A clinical entry as the corrected log reads it now, without the correction history. */
  private currentEntry(codeId: string, id: string): ClinicalEntry | undefined {
    const found = effectiveEntries(this.repo.entriesOf(codeId)).find((e) => e.id === id);
    if (!found) return undefined;
    const { original: _original, amendments: _amendments, voided: _voided, ...current } = found;
    return current;
  }

  /** The code's status follows its log: ended by the first end entry that still stands. */
  private syncCodeStatus(codeId: string): void {
    const end = liveEntries(this.repo.entriesOf(codeId)).find((e) => e.kind === 'end');
    if (end && end.kind === 'end') {
      this.repo.updateCode(codeId, { status: 'ended', endedAt: new Date(end.at).toISOString(), outcome: end.outcome });
    } else {
      this.repo.updateCode(codeId, { status: 'active', endedAt: null, outcome: null });
    }
  }
}
