import { Inject, Injectable } from '@nestjs/common';
import type { DoseUnit, PharmacyUnit, ReconciliationLineInput, TrayItem, TrayTemplate } from '@steadyhand/shared';
import { and, asc, desc, eq, gte, inArray, isNotNull } from 'drizzle-orm';
import { DB } from '../db/database.module.js';
import type { Db } from '../db/database.js';
import {
  auditEvents,
  codes,
  mailLog,
  reconciliationAddenda,
  reconciliationLines,
  reconciliations,
  settings,
  signatures,
  trayItems,
  trayTemplates,
  units,
  unitTrays,
  users,
} from '../db/schema/index.js';

export type ReconciliationRow = typeof reconciliations.$inferSelect;
export type AddendumRow = typeof reconciliationAddenda.$inferSelect & { by: string };
type LineRow = typeof reconciliationLines.$inferSelect;

function toItem(row: typeof trayItems.$inferSelect): TrayItem {
  return {
    id: row.id,
    drugKey: row.drugKey,
    label: row.label,
    strengthAmount: row.strengthAmount,
    strengthUnit: row.strengthUnit as DoseUnit,
    volumeMl: row.volumeMl,
    quantity: row.quantity,
    controlled: row.controlled,
    sortOrder: row.sortOrder,
    lot: row.lot,
    expiry: row.expiry,
  };
}

export function toLine(row: LineRow): ReconciliationLineInput {
  return {
    drugKey: row.drugKey,
    trayItemId: row.trayItemId,
    unitsOpened: row.unitsOpened,
    unitsWasted: row.unitsWasted,
    wasteWitness: row.wasteWitness,
    lotNumbers: row.lotNumbers,
    note: row.note,
  };
}

function matchUnit<U extends { id: string; name: string }>(all: U[], code: { unitId: string | null; location: string | null }): U | undefined {
  if (code.unitId) return all.find((u) => u.id === code.unitId);
  const location = code.location?.trim().toLowerCase();
  if (!location) return undefined;
  return all.find((u) => location.startsWith(u.name.toLowerCase()));
}

/** Tray templates, unit assignments, reconciliations, their lines and addenda. */
@Injectable()
export class PharmacyRepository {
  constructor(@Inject(DB) readonly db: Db) {}

  // ------------------------------------------------------------ trays

  listTrays(): TrayTemplate[] {
    const trays = this.db.select().from(trayTemplates).orderBy(asc(trayTemplates.name)).all();
    const items = this.db.select().from(trayItems).orderBy(asc(trayItems.sortOrder)).all();
    const assigned = this.db.select().from(unitTrays).all();
    return trays.map((t) => ({
      id: t.id,
      name: t.name,
      active: t.active,
      updatedAt: t.updatedAt,
      items: items.filter((i) => i.trayId === t.id).map(toItem),
      unitIds: assigned.filter((a) => a.trayId === t.id).map((a) => a.unitId),
    }));
  }

  findTray(id: string): TrayTemplate | undefined {
    return this.listTrays().find((t) => t.id === id);
  }

  trayNameTaken(name: string, exceptId?: string): boolean {
    const row = this.db.select({ id: trayTemplates.id }).from(trayTemplates).where(eq(trayTemplates.name, name)).get();
    return row !== undefined && row.id !== exceptId;
  }

  /** Writes a tray and its items; items keep their ids when given, others are removed. */
  saveTray(tray: { id: string; name: string; active: boolean; items: TrayItem[] }, now: string, isNew: boolean): void {
    this.db.transaction((tx) => {
      if (isNew) tx.insert(trayTemplates).values({ id: tray.id, name: tray.name, active: tray.active, createdAt: now, updatedAt: now }).run();
      else tx.update(trayTemplates).set({ name: tray.name, active: tray.active, updatedAt: now }).where(eq(trayTemplates.id, tray.id)).run();
      tx.delete(trayItems).where(eq(trayItems.trayId, tray.id)).run();
      for (const item of tray.items) tx.insert(trayItems).values({ ...item, trayId: tray.id }).run();
    });
  }

  listUnits(): PharmacyUnit[] {
    const rows = this.db
      .select({ id: units.id, name: units.name, trayId: unitTrays.trayId, trayName: trayTemplates.name })
      .from(units)
      .leftJoin(unitTrays, eq(unitTrays.unitId, units.id))
      .leftJoin(trayTemplates, eq(trayTemplates.id, unitTrays.trayId))
      .where(eq(units.active, true))
      .orderBy(asc(units.name))
      .all();
    return rows.map((r) => ({ id: r.id, name: r.name, trayId: r.trayId ?? null, trayName: r.trayName ?? null }));
  }

  unitExists(id: string): boolean {
    return this.db.select({ id: units.id }).from(units).where(eq(units.id, id)).get() !== undefined;
  }

  assignTray(unitId: string, trayId: string | null): void {
    this.db.transaction((tx) => {
      tx.delete(unitTrays).where(eq(unitTrays.unitId, unitId)).run();
      if (trayId) tx.insert(unitTrays).values({ unitId, trayId }).run();
    });
  }

  /** The unit a code happened in: its unit id, else a unit whose name starts its location text. */
  unitOf(code: { unitId: string | null; location: string | null }): { id: string; name: string } | undefined {
    return matchUnit(this.db.select({ id: units.id, name: units.name }).from(units).all(), code);
  }

  findUnit(id: string): { id: string; name: string } | undefined {
    return this.db.select({ id: units.id, name: units.name }).from(units).where(eq(units.id, id)).get();
  }

  /** Codes of a unit (as unitOf reads them) whose arrest was at or after `since`, oldest first. */
  codesOfUnitSince(unitId: string, since: string): (typeof codes.$inferSelect)[] {
    const all = this.db.select({ id: units.id, name: units.name }).from(units).all();
    return this.db
      .select()
      .from(codes)
      .where(gte(codes.arrestAt, since))
      .orderBy(asc(codes.arrestAt))
      .all()
      .filter((c) => matchUnit(all, c)?.id === unitId);
  }

  trayOfUnit(unitId: string): string | undefined {
    return this.db.select({ trayId: unitTrays.trayId }).from(unitTrays).where(eq(unitTrays.unitId, unitId)).get()?.trayId;
  }

  // ------------------------------------------------------------ codes

  /** Ended codes without a signed reconciliation, oldest arrest first. */
  codesAwaiting(limit = 200): (typeof codes.$inferSelect & { reconciliation: ReconciliationRow['status'] | null })[] {
    const rows = this.db
      .select({ code: codes, status: reconciliations.status })
      .from(codes)
      .leftJoin(reconciliations, eq(reconciliations.codeId, codes.id))
      .where(eq(codes.status, 'ended'))
      .orderBy(asc(codes.arrestAt))
      .all();
    return rows
      .filter((r) => r.status !== 'signed')
      .slice(0, limit)
      .map((r) => ({ ...r.code, reconciliation: r.status ?? null }));
  }

  signaturesOf(codeIds: string[]): (typeof signatures.$inferSelect)[] {
    if (codeIds.length === 0) return [];
    return this.db.select().from(signatures).where(inArray(signatures.codeId, codeIds)).orderBy(asc(signatures.signedAt)).all();
  }

  // ------------------------------------------------------------ reconciliations

  findReconciliation(codeId: string): ReconciliationRow | undefined {
    return this.db.select().from(reconciliations).where(eq(reconciliations.codeId, codeId)).get();
  }

  linesOf(codeId: string): ReconciliationLineInput[] {
    return this.db.select().from(reconciliationLines).where(eq(reconciliationLines.codeId, codeId)).orderBy(asc(reconciliationLines.drugKey)).all().map(toLine);
  }

  /** Replaces the draft: the row, and every line. */
  saveDraft(input: { codeId: string; userId: string; trayId: string | null; notes: string | null; lines: ReconciliationLineInput[] }, now: string, newId: () => string): void {
    this.db.transaction((tx) => {
      const existing = tx.select().from(reconciliations).where(eq(reconciliations.codeId, input.codeId)).get();
      if (existing) {
        tx.update(reconciliations).set({ trayId: input.trayId, notes: input.notes, updatedAt: now }).where(eq(reconciliations.codeId, input.codeId)).run();
      } else {
        tx.insert(reconciliations)
          .values({ codeId: input.codeId, trayId: input.trayId, status: 'draft', notes: input.notes, startedBy: input.userId, startedAt: now, updatedAt: now })
          .run();
      }
      tx.delete(reconciliationLines).where(eq(reconciliationLines.codeId, input.codeId)).run();
      for (const line of input.lines) tx.insert(reconciliationLines).values({ id: newId(), codeId: input.codeId, ...line }).run();
    });
  }

  /** Marks the draft signed, only if it is still a draft (the caller checks the answer). */
  markSigned(codeId: string, userId: string, now: string): boolean {
    const result = this.db
      .update(reconciliations)
      .set({ status: 'signed', signedBy: userId, signedAt: now, updatedAt: now })
      .where(and(eq(reconciliations.codeId, codeId), eq(reconciliations.status, 'draft')))
      .run();
    return result.changes === 1;
  }

  insertAddendum(row: typeof reconciliationAddenda.$inferInsert): void {
    this.db.insert(reconciliationAddenda).values(row).run();
  }

  addendaOf(codeId: string): AddendumRow[] {
    return this.db
      .select({ addendum: reconciliationAddenda, by: users.displayName })
      .from(reconciliationAddenda)
      .innerJoin(users, eq(users.id, reconciliationAddenda.userId))
      .where(eq(reconciliationAddenda.codeId, codeId))
      .orderBy(asc(reconciliationAddenda.at), asc(reconciliationAddenda.id))
      .all()
      .map((r) => ({ ...r.addendum, by: r.by }));
  }

  displayName(userId: string): string | null {
    return this.db.select({ name: users.displayName }).from(users).where(eq(users.id, userId)).get()?.name ?? null;
  }

  /** The sign-off's snapshot, kept in the append-only audit trail. */
  signedSnapshot(codeId: string): Record<string, unknown> | undefined {
    const row = this.db
      .select({ detail: auditEvents.detail })
      .from(auditEvents)
      .where(and(eq(auditEvents.action, 'reconciliation.signed'), eq(auditEvents.codeId, codeId), isNotNull(auditEvents.detail)))
      .orderBy(desc(auditEvents.id))
      .get();
    return row?.detail ?? undefined;
  }

  lastPharmacyMail(codeId: string): { sentAt: string; to: string; status: string } | null {
    const row = this.db
      .select({ sentAt: mailLog.sentAt, to: mailLog.to, status: mailLog.status, subject: mailLog.subject })
      .from(mailLog)
      .where(eq(mailLog.codeId, codeId))
      .orderBy(desc(mailLog.id))
      .all()
      .find((r) => r.subject.startsWith(PHARMACY_MAIL_SUBJECT));
    return row ? { sentAt: row.sentAt, to: row.to, status: row.status } : null;
  }

  facilityName(): string {
    const value = this.db.select({ value: settings.value }).from(settings).where(eq(settings.key, 'facility')).get()?.value as { name?: unknown } | undefined;
    return typeof value?.name === 'string' && value.name.trim() ? value.name.trim() : 'Steadyhand';
  }
}

export const PHARMACY_MAIL_SUBJECT = 'Drug discrepancy';
