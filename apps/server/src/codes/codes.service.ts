import { randomUUID } from 'node:crypto';
import { ConflictException, Inject, Injectable, NotFoundException } from '@nestjs/common';
import {
  computeDosing,
  summarizeCode,
  type Code,
  type CodeStatus,
  type CreateCodeRequest,
  type DosingSheet,
  type CodeSummary,
  type StoredEntry,
  type UpdateCodeRequest,
} from '@steadyhand/shared';
import { AuditService } from '../audit/audit.service.js';
import type { SessionUser } from '../auth/session-user.js';
import { ProtocolService } from '../protocol/protocol.service.js';
import { CodesRepository } from './codes.repository.js';
import { EntryEvents } from './entry-events.js';

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
  create(user: SessionUser, input: CreateCodeRequest & { category: 'adult' | 'pediatric' }, options: { refill?: boolean } = {}): { code: Code; created: boolean } {
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
      location: input.location ?? null,
      unitId: input.unitId ?? null,
      patient: input.patient ?? null,
      arrestAt: input.arrestAt ? new Date(input.arrestAt).toISOString() : now,
      createdAt: now,
      createdBy: user.id,
    });
    this.audit.record({
      action: options.refill ? 'code.refilled' : 'code.created',
      userId: user.id,
      username: user.username,
      codeId: code.id,
      detail: options.refill ? { category: code.category, arrestAt: code.arrestAt, from: 'device' } : { category: code.category },
    });
    this.events.emitCodesChanged(code.id);
    return { code, created: true };
  }

  list(status?: CodeStatus): Code[] {
    return this.repo.listCodes(status);
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
    const after = this.repo.updateCode(id, changes);
    const changed = Object.fromEntries(
      Object.keys(changes).map((k) => [k, { from: before[k as keyof Code] ?? null, to: after[k as keyof Code] ?? null }]),
    );
    this.audit.record({ action: 'code.details-changed', userId: user.id, username: user.username, codeId: id, detail: changed });
    this.events.emitCodesChanged(id);
    return after;
  }

  dosing(id: string): DosingSheet {
    const code = this.get(id);
    return computeDosing({ category: code.category, weightKg: code.weightKg }, this.protocol.current());
  }

  summary(id: string): CodeSummary {
    const { code, entries } = this.withEntries(id);
    return summarizeCode({ code, entries, settings: this.protocol.current() });
  }
}
