import { ConflictException, Inject, Injectable } from '@nestjs/common';
import {
  daysSince,
  FOLLOW_UP_ITEMS,
  followUpMissing,
  followUpProblems,
  type FollowUp,
  type FollowUpAnswer,
  type FollowUpListQuery,
  type FollowUpListResponse,
  type FollowUpRequest,
  type FollowUpValues,
  type Outcome,
} from '@steadyhand/shared';
import { AuditService } from '../audit/audit.service.js';
import type { SessionUser } from '../auth/session-user.js';
import { CodesService } from '../codes/codes.service.js';
import { fieldProblemsError } from '../common/zod-validation.pipe.js';
import { QualityRepository, type FollowUpRow } from './quality.repository.js';

type Item = (typeof FOLLOW_UP_ITEMS)[number];

/** The stored columns of each follow-up item. */
const COLUMNS = {
  survivalToDischarge: {
    date: 'survivalToDischargeDate',
    by: 'survivalToDischargeBy',
    byName: 'survivalToDischargeByName',
    at: 'survivalToDischargeAt',
  },
  status30Days: {
    date: 'status30DaysDate',
    by: 'status30DaysBy',
    byName: 'status30DaysByName',
    at: 'status30DaysAt',
  },
  neurologicalOutcome: {
    date: 'neurologicalOutcomeDate',
    by: 'neurologicalOutcomeBy',
    byName: 'neurologicalOutcomeByName',
    at: 'neurologicalOutcomeAt',
  },
} as const satisfies Record<
  Item,
  {
    date: keyof FollowUpRow;
    by: keyof FollowUpRow;
    byName: keyof FollowUpRow;
    at: keyof FollowUpRow;
  }
>;

function valuesOf(row: FollowUpRow | null | undefined): FollowUpValues {
  return {
    survivalToDischarge:
      (row?.survivalToDischarge as FollowUpValues['survivalToDischarge']) ?? null,
    survivalToDischargeDate: row?.survivalToDischargeDate ?? null,
    status30Days: (row?.status30Days as FollowUpValues['status30Days']) ?? null,
    status30DaysDate: row?.status30DaysDate ?? null,
    neurologicalOutcome:
      (row?.neurologicalOutcome as FollowUpValues['neurologicalOutcome']) ?? null,
    neurologicalOutcomeDate: row?.neurologicalOutcomeDate ?? null,
  };
}

/** The follow-up as the API answers it, from its stored row (or none). */
export function followUpFromRow(row: FollowUpRow | null | undefined): FollowUp {
  const answer = <T extends string>(item: Item): FollowUpAnswer<T> | null => {
    const c = COLUMNS[item];
    const value = row?.[item];
    const by = row?.[c.by];
    const at = row?.[c.at];
    if (!row || !value || !by || !at) return null;
    return {
      value: value as T,
      date: row[c.date] ?? null,
      enteredBy: { id: by, displayName: row[c.byName] ?? '' },
      enteredAt: at,
    };
  };
  const missing = followUpMissing(valuesOf(row));
  return {
    survivalToDischarge: answer('survivalToDischarge'),
    status30Days: answer('status30Days'),
    neurologicalOutcome: answer('neurologicalOutcome'),
    complete: missing.length === 0,
    missing,
  };
}

/**
 * The reviewer's follow-up after the event: survival to discharge, the status at 30 days and the
 * neurological outcome, each with its date and who entered it. Stays open after the quality review
 * is signed off, since the 30-day status often arrives later; every change is audited.
 */
@Injectable()
export class FollowUpService {
  constructor(
    @Inject(QualityRepository) private readonly repo: QualityRepository,
    @Inject(CodesService) private readonly codes: CodesService,
    @Inject(AuditService) private readonly audit: AuditService,
  ) {}

  of(codeId: string): FollowUp {
    return followUpFromRow(this.repo.followUp(codeId));
  }

  save(user: SessionUser, codeId: string, body: FollowUpRequest): FollowUp {
    const code = this.codes.get(codeId);
    if (code.status !== 'ended')
      throw new ConflictException('The code has not ended: its follow-up is entered after it ends');
    const row = this.repo.followUp(codeId);
    const before = valuesOf(row);
    const next: FollowUpValues = { ...before };
    for (const item of FOLLOW_UP_ITEMS) {
      const dateKey = `${item}Date` as const;
      if (body[item] !== undefined) {
        (next as Record<string, unknown>)[item] = body[item];
        // An answer cleared or made unknown takes its date with it, unless a date is sent too.
        if ((body[item] === null || body[item] === 'unknown') && body[dateKey] === undefined)
          next[dateKey] = null;
      }
      if (body[dateKey] !== undefined) next[dateKey] = body[dateKey];
    }
    const today = new Date().toISOString().slice(0, 10);
    const problems = followUpProblems(next, code, today);
    if (problems.length > 0) throw fieldProblemsError(problems);

    const now = new Date().toISOString();
    const stored: FollowUpRow = {
      codeId,
      survivalToDischarge: null,
      survivalToDischargeDate: null,
      survivalToDischargeBy: null,
      survivalToDischargeByName: null,
      survivalToDischargeAt: null,
      status30Days: null,
      status30DaysDate: null,
      status30DaysBy: null,
      status30DaysByName: null,
      status30DaysAt: null,
      neurologicalOutcome: null,
      neurologicalOutcomeDate: null,
      neurologicalOutcomeBy: null,
      neurologicalOutcomeByName: null,
      neurologicalOutcomeAt: null,
      ...row,
      complete: followUpMissing(next).length === 0,
      updatedAt: now,
    };
    const changes: Record<string, { from: unknown; to: unknown }> = {};
    for (const item of FOLLOW_UP_ITEMS) {
      const c = COLUMNS[item];
      const dateKey = `${item}Date` as const;
      for (const k of [item, dateKey] as const)
        if (before[k] !== next[k]) changes[k] = { from: before[k] ?? null, to: next[k] ?? null };
      if (before[item] === next[item] && before[dateKey] === next[dateKey]) continue;
      // Who entered an answer is whoever last changed it (or its date).
      Object.assign(stored, {
        [item]: next[item] ?? null,
        [c.date]: next[dateKey] ?? null,
        [c.by]: next[item] ? user.id : null,
        [c.byName]: next[item] ? user.displayName : null,
        [c.at]: next[item] ? now : null,
      });
    }
    if (Object.keys(changes).length === 0) return followUpFromRow(row);
    this.repo.saveFollowUp(stored);
    this.audit.record({
      action: 'quality.follow-up-saved',
      userId: user.id,
      username: user.username,
      codeId,
      detail: { ...changes, complete: stored.complete },
    });
    return followUpFromRow(stored);
  }

  /** Codes still waiting for their follow-up, oldest arrest first, with how long since the arrest. */
  waiting(q: FollowUpListQuery): FollowUpListResponse {
    const { rows, total } = this.repo.followUpWaiting(q);
    const now = Date.now();
    return {
      items: rows.map((r) => ({
        codeId: r.codeId,
        arrestAt: r.arrestAt,
        daysSinceArrest: daysSince(r.arrestAt, now),
        unitId: r.unitId,
        unitName: r.unitName,
        location: r.location,
        outcome: r.outcome as Outcome | null,
        anyRosc: r.anyRosc,
        followUp: followUpFromRow(r.followUp),
      })),
      total,
      page: q.page,
      pageSize: q.pageSize,
      units: this.repo.units(),
    };
  }
}
