import { Inject, Injectable } from '@nestjs/common';
import type {
  CodeCategory,
  FollowUpListQuery,
  Outcome,
  QualityFilter,
  QualityListItem,
  QualityListQuery,
  QualityMetricsRow,
  QualityTargetId,
  QualityUnit,
  Rhythm,
  SurvivalToDischarge,
} from '@steadyhand/shared';
import { and, asc, desc, eq, gt, gte, inArray, isNull, like, lt, or, sql, type SQL } from 'drizzle-orm';
import { DB } from '../db/database.module.js';
import type { Db } from '../db/database.js';
import { codeFollowUps, codeMetrics, codes, qualityReviews, settings, signatures, units, users } from '../db/schema/index.js';
import { parseTargetsMissed, type CodeMetricsRow } from './quality-metrics.js';

export type QualityReviewRow = typeof qualityReviews.$inferSelect;
export type FollowUpRow = typeof codeFollowUps.$inferSelect;

/** A code waiting for its follow-up, as the list reads it. */
export interface FollowUpWaitingRow {
  codeId: string;
  arrestAt: string;
  unitId: string | null;
  unitName: string | null;
  location: string | null;
  outcome: string | null;
  anyRosc: boolean;
  followUp: FollowUpRow | null;
}

/** The day after a YYYY-MM-DD date, so `to` covers its whole (UTC) day. */
function nextDay(date: string): string {
  const d = new Date(`${date}T00:00:00.000Z`);
  d.setUTCDate(d.getUTCDate() + 1);
  return d.toISOString();
}

/** WHERE conditions on code_metrics for the list, the stats and the CSV export. */
export function qualityConditions(f: QualityFilter): SQL | undefined {
  const c: (SQL | undefined)[] = [];
  if (f.from) c.push(gte(codeMetrics.arrestAt, `${f.from}T00:00:00.000Z`));
  if (f.to) c.push(lt(codeMetrics.arrestAt, nextDay(f.to)));
  if (f.unitId) c.push(eq(codeMetrics.unitId, f.unitId));
  if (f.firstRhythm) c.push(f.firstRhythm === 'none' ? isNull(codeMetrics.firstRhythm) : eq(codeMetrics.firstRhythm, f.firstRhythm));
  // The older and the current word for ending in ROSC mean the same: either finds both.
  if (f.outcome) c.push(f.outcome === 'rosc' || f.outcome === 'sustained-rosc' ? inArray(codeMetrics.outcome, ['rosc', 'sustained-rosc']) : eq(codeMetrics.outcome, f.outcome));
  if (f.missed === 'any') c.push(gt(codeMetrics.targetsMissedCount, 0));
  else if (f.missed) c.push(like(codeMetrics.targetsMissed, `%,${f.missed},%`));
  return c.length ? and(...c) : undefined;
}

const SORT_COLUMNS = {
  arrestAt: codeMetrics.arrestAt,
  unit: units.name,
  firstRhythm: codeMetrics.firstRhythm,
  outcome: codeMetrics.outcome,
  durationSeconds: codeMetrics.durationSeconds,
  toFirstShockSeconds: codeMetrics.toFirstShockSeconds,
  toFirstEpinephrineSeconds: codeMetrics.toFirstEpinephrineSeconds,
  compressionFraction: codeMetrics.compressionFraction,
  targetsMissed: codeMetrics.targetsMissedCount,
} as const;

@Injectable()
export class QualityRepository {
  constructor(@Inject(DB) private readonly db: Db) {}

  upsertMetrics(row: CodeMetricsRow): void {
    this.db.insert(codeMetrics).values(row).onConflictDoUpdate({ target: codeMetrics.codeId, set: row }).run();
  }

  deleteMetrics(codeId: string): void {
    this.db.delete(codeMetrics).where(eq(codeMetrics.codeId, codeId)).run();
  }

  /** Ended codes without a metrics row (codes ended before this module kept the table). */
  endedCodesWithoutMetrics(): string[] {
    return this.db
      .select({ id: codes.id })
      .from(codes)
      .leftJoin(codeMetrics, eq(codeMetrics.codeId, codes.id))
      .where(and(eq(codes.status, 'ended'), isNull(codeMetrics.codeId)))
      .all()
      .map((r) => r.id);
  }

  list(q: QualityListQuery): { items: QualityListItem[]; total: number } {
    const where = qualityConditions(q);
    const total = this.db.select({ n: sql<number>`count(*)` }).from(codeMetrics).where(where).get()?.n ?? 0;
    const column = SORT_COLUMNS[q.sort];
    const direction = q.dir === 'asc' ? asc : desc;
    // Sort and cut the page on code_metrics alone (units only for the unit sort), then read the
    // page's 25 rows with their joins: the joins never run over the whole year.
    const base = this.db.select({ id: codeMetrics.codeId }).from(codeMetrics);
    const pageIds = (q.sort === 'unit' ? base.leftJoin(units, eq(units.id, codeMetrics.unitId)) : base)
      .where(where)
      // Codes without the value go last either way; ties by newest arrest, then id, so pages never overlap.
      .orderBy(sql`${column} is null`, direction(column), desc(codeMetrics.arrestAt), asc(codeMetrics.codeId))
      .limit(q.pageSize)
      .offset((q.page - 1) * q.pageSize)
      .all()
      .map((r) => r.id);
    if (pageIds.length === 0) return { total, items: [] };
    const order = new Map(pageIds.map((id, i) => [id, i]));
    const rows = this.db
      .select({
        m: codeMetrics,
        location: codes.location,
        unitName: units.name,
        reviewedAt: qualityReviews.reviewedAt,
        signed: sql<number>`exists(select 1 from ${signatures} where ${signatures.codeId} = ${codeMetrics.codeId})`,
      })
      .from(codeMetrics)
      .innerJoin(codes, eq(codes.id, codeMetrics.codeId))
      .leftJoin(units, eq(units.id, codeMetrics.unitId))
      .leftJoin(qualityReviews, eq(qualityReviews.codeId, codeMetrics.codeId))
      .where(inArray(codeMetrics.codeId, pageIds))
      .all()
      .sort((a, b) => (order.get(a.m.codeId) ?? 0) - (order.get(b.m.codeId) ?? 0));
    return {
      total,
      items: rows.map(({ m, location, unitName, reviewedAt, signed }) => ({
        codeId: m.codeId,
        arrestAt: m.arrestAt,
        unitId: m.unitId,
        unitName: unitName ?? null,
        location,
        category: m.category as CodeCategory,
        firstRhythm: m.firstRhythm as Rhythm | null,
        outcome: m.outcome as Outcome | null,
        anyRosc: m.anyRosc,
        sustainedRosc: m.sustainedRosc,
        durationSeconds: m.durationSeconds,
        toFirstShockSeconds: m.toFirstShockSeconds,
        toFirstEpinephrineSeconds: m.toFirstEpinephrineSeconds,
        compressionFraction: m.compressionFraction,
        maxPreShockPauseSeconds: m.maxPreShockPauseSeconds,
        targetsMissed: parseTargetsMissed(m.targetsMissed) as QualityTargetId[],
        recordSigned: Boolean(signed),
        reviewedAt: reviewedAt ?? null,
      })),
    };
  }

  /** The numbers the stats need, for every code that matches. */
  statsRows(f: QualityFilter): QualityMetricsRow[] {
    return this.db
      .select({
        arrestAt: codeMetrics.arrestAt,
        unitId: codeMetrics.unitId,
        unitName: units.name,
        firstRhythm: codeMetrics.firstRhythm,
        witnessedOrMonitored: codeMetrics.witnessedOrMonitored,
        anyRosc: codeMetrics.anyRosc,
        survivalToDischarge: codeFollowUps.survivalToDischarge,
        followUpComplete: codeFollowUps.complete,
        durationSeconds: codeMetrics.durationSeconds,
        toCompressionsSeconds: codeMetrics.toCompressionsSeconds,
        toFirstShockSeconds: codeMetrics.toFirstShockSeconds,
        toFirstEpinephrineSeconds: codeMetrics.toFirstEpinephrineSeconds,
        compressionFraction: codeMetrics.compressionFraction,
        maxPreShockPauseSeconds: codeMetrics.maxPreShockPauseSeconds,
      })
      .from(codeMetrics)
      .leftJoin(units, eq(units.id, codeMetrics.unitId))
      .leftJoin(codeFollowUps, eq(codeFollowUps.codeId, codeMetrics.codeId))
      .where(qualityConditions(f))
      .orderBy(asc(codeMetrics.arrestAt))
      .all()
      .map((r) => ({
        ...r,
        firstRhythm: r.firstRhythm as Rhythm | null,
        survivalToDischarge: (r.survivalToDischarge as SurvivalToDischarge | null) ?? null,
        followUpComplete: r.followUpComplete ?? false,
      }));
  }

  // --- follow-up ---------------------------------------------------------------------------------

  followUp(codeId: string): FollowUpRow | undefined {
    return this.db.select().from(codeFollowUps).where(eq(codeFollowUps.codeId, codeId)).get();
  }

  saveFollowUp(row: FollowUpRow): void {
    const { codeId: _codeId, ...set } = row;
    this.db.insert(codeFollowUps).values(row).onConflictDoUpdate({ target: codeFollowUps.codeId, set }).run();
  }

  /** Ended codes whose follow-up is not complete, oldest arrest first (one unit, or all). */
  followUpWaiting(q: FollowUpListQuery): { rows: FollowUpWaitingRow[]; total: number } {
    const where = and(
      or(isNull(codeFollowUps.codeId), eq(codeFollowUps.complete, false)),
      q.unitId ? eq(codeMetrics.unitId, q.unitId) : undefined,
    );
    const base = () => this.db.select({ n: sql<number>`count(*)` }).from(codeMetrics).leftJoin(codeFollowUps, eq(codeFollowUps.codeId, codeMetrics.codeId));
    const total = base().where(where).get()?.n ?? 0;
    const rows = this.db
      .select({ m: codeMetrics, location: codes.location, unitName: units.name, f: codeFollowUps })
      .from(codeMetrics)
      .innerJoin(codes, eq(codes.id, codeMetrics.codeId))
      .leftJoin(units, eq(units.id, codeMetrics.unitId))
      .leftJoin(codeFollowUps, eq(codeFollowUps.codeId, codeMetrics.codeId))
      .where(where)
      .orderBy(asc(codeMetrics.arrestAt), asc(codeMetrics.codeId))
      .limit(q.pageSize)
      .offset((q.page - 1) * q.pageSize)
      .all();
    return {
      total,
      rows: rows.map(({ m, location, unitName, f }) => ({
        codeId: m.codeId,
        arrestAt: m.arrestAt,
        unitId: m.unitId,
        unitName: unitName ?? null,
        location,
        outcome: m.outcome,
        anyRosc: m.anyRosc,
        followUp: f ?? null,
      })),
    };
  }

  /** The follow-up rows of several codes (for the CSV export). */
  followUpsOf(codeIds: readonly string[]): Map<string, FollowUpRow> {
    if (codeIds.length === 0) return new Map();
    const rows: FollowUpRow[] = [];
    // SQLite limits bound parameters: a year of codes goes in slices.
    for (let i = 0; i < codeIds.length; i += 500) {
      rows.push(...this.db.select().from(codeFollowUps).where(inArray(codeFollowUps.codeId, codeIds.slice(i, i + 500))).all());
    }
    return new Map(rows.map((r) => [r.codeId, r]));
  }

  /** Ids of the matching codes in arrest order, for the CSV export. */
  codeIds(f: QualityFilter): string[] {
    return this.db.select({ id: codeMetrics.codeId }).from(codeMetrics).where(qualityConditions(f)).orderBy(asc(codeMetrics.arrestAt), asc(codeMetrics.codeId)).all().map((r) => r.id);
  }

  units(): QualityUnit[] {
    return this.db.select({ id: units.id, name: units.name }).from(units).orderBy(asc(units.name)).all();
  }

  unitName(id: string | null): string | null {
    if (!id) return null;
    return this.db.select({ name: units.name }).from(units).where(eq(units.id, id)).get()?.name ?? null;
  }

  review(codeId: string): (QualityReviewRow & { reviewerName: string | null }) | undefined {
    return this.db
      .select({ r: qualityReviews, reviewerName: users.displayName })
      .from(qualityReviews)
      .leftJoin(users, eq(users.id, qualityReviews.reviewedBy))
      .where(eq(qualityReviews.codeId, codeId))
      .all()
      .map(({ r, reviewerName }) => ({ ...r, reviewerName }))[0];
  }

  saveReview(codeId: string, changes: Partial<Omit<QualityReviewRow, 'codeId'>> & { updatedAt: string }): void {
    this.db.insert(qualityReviews).values({ codeId, ...changes }).onConflictDoUpdate({ target: qualityReviews.codeId, set: changes }).run();
  }

  signaturesOf(codeId: string): (typeof signatures.$inferSelect)[] {
    return this.db.select().from(signatures).where(eq(signatures.codeId, codeId)).orderBy(asc(signatures.signedAt), asc(signatures.id)).all();
  }

  facility(): string {
    const row = this.db.select({ value: settings.value }).from(settings).where(eq(settings.key, 'facility')).get();
    const name = (row?.value as { name?: unknown } | undefined)?.name;
    return typeof name === 'string' && name.trim() ? name.trim() : 'Steadyhand';
  }
}
