import { randomUUID } from 'node:crypto';
import { BadRequestException, ConflictException, Inject, Injectable, NotFoundException } from '@nestjs/common';
import {
  entryTimeMs,
  foldLog,
  liveEntries,
  stateAnswer,
  stateAt,
  summarize,
  type Code,
  type CodeStateAnswer,
  type CodeStatus,
  type CodeSummary,
  type CreateCodeRequest,
  type DosingSheet,
  type ProtocolSettings,
  type StoredEntry,
  type Timeline,
  type UpdateCodeRequest,
  type UtsteinAddendum,
  type UtsteinDetails,
  effectiveUtstein,
} from '@steadyhand/shared';
import { AuditService } from '../audit/audit.service.js';
import type { SessionUser } from '../auth/session-user.js';
import { ProtocolService } from '../protocol/protocol.service.js';
import { CodesRepository } from './codes.repository.js';
import type { EntryLink } from './entry-chain.js';
import { EntryEvents } from './entry-events.js';

/** How far ahead of the server's clock an arrest time may be set (a device clock a little fast). */
const ARREST_AT_FUTURE_SLACK_MS = 60_000;

@Injectable()
export class CodesService {
  constructor(
    @Inject(CodesRepository) private readonly repo: CodesRepository,
    @Inject(ProtocolService) private readonly protocol: ProtocolService,
    @Inject(EntryEvents) private readonly events: EntryEvents,
    @Inject(AuditService) private readonly audit: AuditService,
  ) {}

  /**
   * Starts a code. A retried start with the same device-made id returns the code already started.
   * `refill`: a device starts again a code the server does not know (restored from an older copy),
   * with the id and details it kept; whoever started it, a code that exists is answered as it is.
   */
  create(
    user: SessionUser,
    input: CreateCodeRequest & { category: 'adult' | 'pediatric' },
    options: { refill?: boolean; protocolVersion?: number } = {},
  ): { code: Code; created: boolean } {
    if (input.id) {
      const existing = this.repo.findCode(input.id);
      if (existing) {
        if (existing.createdBy !== user.id && !options.refill) throw new ConflictException(`Code ${input.id} already exists`);
        return { code: existing, created: false };
      }
    }
    const now = new Date().toISOString();
    const code = this.repo.insertCode({
      id: input.id ?? randomUUID(),
      status: 'active',
      category: input.category,
      weightKg: input.weightKg ?? null,
      weightSource: input.weightKg !== undefined ? (input.weightSource ?? null) : null,
      location: input.location ?? null,
      unitId: input.unitId ?? null,
      patient: input.patient ?? null,
      arrestAt: input.arrestAt ? new Date(input.arrestAt).toISOString() : now,
      createdAt: now,
      createdBy: user.id,
      // The code keeps the protocol in force now (or, started again from a device, the one it had), whatever an admin saves later.
      protocolVersion: this.protocol.knownVersion(options.protocolVersion) ?? this.protocol.currentVersion(),
    });
    this.audit.record({
      action: options.refill ? 'code.refilled' : 'code.created',
      userId: user.id,
      username: user.username,
      codeId: code.id,
      detail: options.refill
        ? { category: code.category, arrestAt: code.arrestAt, protocolVersion: code.protocolVersion, from: 'device' }
        : { category: code.category, protocolVersion: code.protocolVersion },
    });
    this.events.emitCodesChanged(code.id);
    return { code, created: true };
  }

  list(status?: CodeStatus, limit?: number): Code[] {
    return this.repo.listCodes(status, limit);
  }

  find(id: string): Code | undefined {
    return this.repo.findCode(id);
  }

  /** The stored log in cursor order (every correction and addendum). */
  entriesOf(id: string): StoredEntry[] {
    return this.repo.entriesOf(id);
  }

  /** Team and debrief notes kept beside the code, completed at review. */
  reviewDetails(id: string): ReturnType<CodesRepository['reviewDetails']> {
    return this.repo.reviewDetails(id);
  }

  /**
   * The registry details: as stored with the code (`signed`: as they stood at the first signature,
   * once signed), the addenda since, and how they read now.
   */
  utsteinState(id: string): { stored: UtsteinDetails; addenda: UtsteinAddendum[]; now: UtsteinDetails } {
    const stored = this.repo.utsteinOf(id) ?? {};
    const addenda = this.repo.detailAddendaOf(id);
    return { stored, addenda, now: effectiveUtstein(stored, addenda) };
  }

  /** The registry details as they read now. */
  utsteinOf(id: string): UtsteinDetails {
    return this.utsteinState(id).now;
  }

  // --- what the signed record reads and keeps beside a code (records module) -------------------

  /** The registry details as stored on the code (as at the first signature, once signed); unset when never given. */
  storedUtsteinOf(id: string): UtsteinDetails | undefined {
    return this.repo.utsteinOf(id);
  }

  /** Changes to the registry details after the first signature, oldest first. */
  detailAddendaOf(id: string): UtsteinAddendum[] {
    return this.repo.detailAddendaOf(id);
  }

  /** Stores the registry details of an unsigned record. */
  setUtstein(id: string, details: UtsteinDetails): void {
    this.repo.setUtstein(id, details);
  }

  /** Adds a registry-details addendum to a signed record (moves its seal in the same write). */
  addDetailAddendum(id: string, addendum: UtsteinAddendum): void {
    this.repo.addDetailAddendum(id, addendum);
  }

  /** Team and debrief notes, and the place and patient, as completed at review. */
  updateReviewFields(id: string, changes: Partial<Pick<Parameters<CodesRepository['updateCode']>[1], 'team' | 'debriefNotes' | 'patient' | 'location'>>): Code {
    return this.repo.updateCode(id, changes);
  }

  isSigned(id: string): boolean {
    return this.repo.isSigned(id);
  }

  /** Keeps the facility name a record was first signed under; later calls change nothing. */
  freezeFacility(id: string, name: string): void {
    this.repo.freezeFacility(id, name);
  }

  frozenFacility(id: string): string | null {
    return this.repo.frozenFacility(id);
  }

  /** The code's hash-chain links in position order. */
  linksOf(id: string): EntryLink[] {
    return this.repo.linksOf(id);
  }

  get(id: string): Code {
    const code = this.repo.findCode(id);
    if (!code) throw new NotFoundException(`No code with id ${id}`);
    return code;
  }

  withEntries(id: string): { code: Code; entries: StoredEntry[] } {
    return { code: this.get(id), entries: this.repo.entriesOf(id) };
  }

  update(user: SessionUser, id: string, changes: UpdateCodeRequest): Code {
    const before = this.get(id);
    // The signed details are part of the signed record: later changes go in as addenda.
    if (this.repo.isSigned(id)) throw new ConflictException('This record is signed: add an addendum');
    const { arrestAt, ...rest } = changes;
    const row: Parameters<CodesRepository['updateCode']>[1] = { ...rest };
    if (arrestAt !== undefined) row.arrestAt = this.checkedArrestAt(id, arrestAt);
    // Switching adult/child recalculates every dose and energy: the screens say when it happened.
    if (changes.category !== undefined && changes.category !== before.category) row.categoryChangedAt = new Date().toISOString();
    if (changes.weightKg === null) row.weightSource = null;
    const after = this.repo.updateCode(id, row);
    const fields = [...Object.keys(changes), ...(row.categoryChangedAt ? ['categoryChangedAt'] : [])] as (keyof Code)[];
    const changed = Object.fromEntries(fields.map((k) => [k, { from: before[k] ?? null, to: after[k] ?? null }]));
    this.audit.record({ action: 'code.details-changed', userId: user.id, username: user.username, codeId: id, detail: changed });
    this.events.emitCodesChanged(id);
    return after;
  }

  /**
   * When the arrest was recognised, set later if recording began late. It cannot come after
   * anything recorded in the code, nor lie in the future.
   */
  private checkedArrestAt(id: string, value: string): string {
    const ms = Date.parse(value);
    if (ms > Date.now() + ARREST_AT_FUTURE_SLACK_MS) throw new BadRequestException('arrestAt: the arrest cannot be recognised in the future');
    const first = liveEntries(this.repo.entriesOf(id))[0];
    if (first && entryTimeMs(first) < ms) {
      throw new BadRequestException(`arrestAt: the arrest must be recognised before the first entry (${first.at})`);
    }
    return new Date(ms).toISOString();
  }

  /** The code's own protocol version. */
  protocolOf(code: Code): ProtocolSettings {
    return this.protocol.forCode(code);
  }

  /**
   * The code's log folded once with its own protocol version: every figure is read from this.
   * `entries` when the caller already holds them (a record as read for signing); else the stored log.
   */
  timelineOf(code: Code, entries: readonly StoredEntry[] = this.repo.entriesOf(code.id)): Timeline {
    return foldLog(code, entries, this.protocol.forCode(code));
  }

  timeline(id: string): Timeline {
    const { code, entries } = this.withEntries(id);
    return this.timelineOf(code, entries);
  }

  /**
   * Whether a person was part of a code: they started it, recorded during it (an entry stored
   * before the code's end was stored; an addendum or a note after the end does not count), or
   * are named on its team (by display name). Writing to a code afterwards makes nobody part of it.
   */
  tookPart(id: string, user: Pick<SessionUser, 'id' | 'displayName'>): boolean {
    const code = this.get(id);
    if (code.createdBy === user.id) return true;
    const entries = this.repo.entriesOf(id);
    const end = liveEntries(entries).find((e) => e.kind === 'end');
    const endedAt = end?.recordedAt ? Date.parse(end.recordedAt) : Number.POSITIVE_INFINITY;
    if (entries.some((e) => e.userId === user.id && !e.addendum && Date.parse(e.recordedAt) <= endedAt)) return true;
    const name = user.displayName.trim().toLowerCase();
    return (this.repo.reviewDetails(id)?.team ?? []).some((m) => m.name.trim().toLowerCase() === name);
  }

  dosing(id: string): DosingSheet {
    const timeline = this.timeline(id);
    if (!timeline.sheet) throw new BadRequestException('This code has a weight the dosing sheet cannot use');
    return timeline.sheet;
  }

  summary(id: string): CodeSummary {
    return summarize(this.timeline(id));
  }

  /** What the pad and the wall showed (or show now) at a moment of the code. */
  state(id: string, at?: string): CodeStateAnswer {
    return stateAnswer(stateAt(this.timeline(id), at === undefined ? Date.now() : Date.parse(at)));
  }
}
