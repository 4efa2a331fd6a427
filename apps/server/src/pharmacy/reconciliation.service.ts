import { randomUUID } from 'node:crypto';
import { BadRequestException, ConflictException, ForbiddenException, Inject, Injectable } from '@nestjs/common';
import {
  DISCREPANCY_WORDS,
  hasAnyRole,
  expiryNote,
  reconcileDrugs,
  reconciliationCounts,
  RESTOCK_CSV_COLUMNS,
  restockRows,
  UNIT_WORDS,
  formatAmount,
  csvCell,
  type Code,
  type DrugTotal,
  type ReconciledDrug,
  type ReconciliationLineInput,
  type ReconciliationView,
  type TrayItem,
  type WorklistItem,
  reconciliationAddendumSchema,
  saveReconciliationSchema,
} from '@steadyhand/shared';
import type { z } from 'zod';
import { AuditService } from '../audit/audit.service.js';
import type { SessionUser } from '../auth/session-user.js';
import { CodesService } from '../codes/codes.service.js';
import type { PasswordAttempt } from '../auth/login-throttle.service.js';
import { PasswordCheckService } from '../auth/password-check.service.js';
import { APP_CONFIG } from '../config/config.module.js';
import type { AppConfig } from '../config/config.js';
import { MailService } from '../mail/mail.service.js';
import { PHARMACY_MAIL_SUBJECT, PharmacyRepository } from './pharmacy.repository.js';
import { renderRestockPdf } from './restock-pdf.js';

type SaveBody = z.output<typeof saveReconciliationSchema>;
type AddendumBody = z.output<typeof reconciliationAddendumSchema>;

/** What a sign-off froze, kept in the audit trail so later tray edits cannot change it. */
interface SignedSnapshot {
  trayId: string | null;
  trayName: string | null;
  items: TrayItem[];
  lines: ReconciliationLineInput[];
  drugTotals: Pick<DrugTotal, 'drug' | 'label' | 'unit' | 'total' | 'doses'>[];
}

interface Computed {
  code: Code;
  view: ReconciliationView;
  unitName: string | null;
}

const totalsKey = (totals: SignedSnapshot['drugTotals']) =>
  JSON.stringify(totals.map((t) => [t.drug, t.unit, t.total, t.doses]).sort());

@Injectable()
export class ReconciliationService {
  constructor(
    @Inject(PharmacyRepository) private readonly repo: PharmacyRepository,
    @Inject(CodesService) private readonly codes: CodesService,
    @Inject(PasswordCheckService) private readonly passwords: PasswordCheckService,
    @Inject(AuditService) private readonly audit: AuditService,
    @Inject(MailService) private readonly mail: MailService,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
  ) {}

  /** Ended codes awaiting a signed reconciliation, oldest first, with counts. */
  worklist(): WorklistItem[] {
    const codes = this.repo.codesAwaiting();
    const signed = new Set(this.repo.signaturesOf(codes.map((c) => c.id)).map((s) => s.codeId));
    return codes.map((c) => {
      const { view, unitName } = this.compute(c.id);
      return {
        codeId: c.id,
        arrestAt: c.arrestAt,
        endedAt: c.endedAt,
        location: c.location,
        unitName,
        outcome: c.outcome,
        recordSigned: signed.has(c.id),
        status: c.reconciliation === 'draft' ? 'draft' : 'not-started',
        drugs: view.counts.drugs,
        doses: view.rows.reduce((n, r) => n + r.doses, 0),
        discrepancies: view.counts.discrepancies,
      };
    });
  }

  /** Pharmacists read every code; recorders and leaders the codes they were part of. */
  read(user: SessionUser, codeId: string): ReconciliationView {
    const { view } = this.compute(codeId);
    if (!hasAnyRole(user.roles, ['pharmacist']) && !this.codes.tookPart(codeId, user)) {
      throw new ForbiddenException('You can read the drug reconciliation of codes you took part in');
    }
    return view;
  }

  save(user: SessionUser, codeId: string, body: SaveBody): ReconciliationView {
    const code = this.codes.get(codeId);
    this.assertOpen(code);
    const existing = this.repo.findReconciliation(codeId);
    const trayId = body.trayId !== undefined ? body.trayId : (existing?.trayId ?? this.defaultTrayId(code));
    if (trayId !== null && !this.repo.findTray(trayId)) throw new BadRequestException(`trayId: no tray template with id ${trayId}`);
    this.repo.saveDraft({ codeId, userId: user.id, trayId, notes: body.notes, lines: body.lines }, new Date().toISOString(), randomUUID);
    this.audit.record({ action: 'reconciliation.saved', userId: user.id, username: user.username, codeId, detail: { lines: body.lines.length } });
    return this.compute(codeId).view;
  }

  async sign(user: SessionUser, codeId: string, password: string, attempt: PasswordAttempt): Promise<ReconciliationView> {
    const code = this.codes.get(codeId);
    this.assertOpen(code);
    // The password again at the moment of signing, as for the record's signatures.
    await this.passwords.confirm(user, password, attempt, { failedAction: 'reconciliation.sign-failed', codeId });
    if (!this.repo.findReconciliation(codeId)) {
      this.repo.saveDraft({ codeId, userId: user.id, trayId: this.defaultTrayId(code), notes: null, lines: [] }, new Date().toISOString(), randomUUID);
    }
    const { view } = this.compute(codeId);
    const trayId = view.tray?.id ?? null;
    const snapshot: SignedSnapshot = {
      trayId,
      trayName: view.tray?.name ?? null,
      items: view.items,
      lines: view.lines,
      drugTotals: this.drugTotals(codeId),
    };
    // Checked again after the await: a second sign-off may have landed meanwhile.
    if (!this.repo.markSigned(codeId, user.id, new Date().toISOString())) throw new ConflictException('This reconciliation is signed already: add an addendum');
    this.audit.record({ action: 'reconciliation.signed', userId: user.id, username: user.username, codeId, detail: { ...snapshot, counts: view.counts } });
    const signed = this.compute(codeId);
    if (signed.view.counts.discrepancies > 0) await this.mailDiscrepancies(signed, user);
    return this.compute(codeId).view;
  }

  addAddendum(user: SessionUser, codeId: string, body: AddendumBody): ReconciliationView {
    this.codes.get(codeId);
    if (this.repo.findReconciliation(codeId)?.status !== 'signed') throw new ConflictException('The reconciliation is not signed yet: change the draft instead');
    const at = new Date().toISOString();
    this.repo.insertAddendum({ id: randomUUID(), codeId, at, userId: user.id, text: body.text, changes: body.lines.length ? { lines: body.lines } : null });
    this.audit.record({ action: 'reconciliation.addendum', userId: user.id, username: user.username, codeId, detail: { text: body.text, lines: body.lines } });
    return this.compute(codeId).view;
  }

  /** The reconciliation as the pharmacist reads it (the cart's restock list sums these). */
  viewOf(codeId: string): ReconciliationView {
    return this.compute(codeId).view;
  }

  /** Who exported which restock list, as every other export is in the audit trail. */
  private auditRestockExport(user: SessionUser, codeId: string, format: 'csv' | 'pdf', view: ReconciliationView): void {
    this.audit.record({ action: 'pharmacy.export-restock', userId: user.id, username: user.username, codeId, detail: { format, status: view.status, trayId: view.tray?.id ?? null } });
  }

  restockCsv(user: SessionUser, codeId: string): { filename: string; body: string } {
    const { view, unitName } = this.compute(codeId);
    this.auditRestockExport(user, codeId, 'csv', view);
    const unit = unitName ?? view.code.location ?? 'unknown unit';
    const tray = view.tray?.name ?? 'no tray';
    const today = new Date().toISOString().slice(0, 10);
    const lines = restockRows(view.rows, today).map((r) => {
      const counts = [r.par ?? '', r.unitsOpened, r.unitsWasted, r.restock];
      const onTray = [r.trayLot ?? '', r.trayExpiry ?? '', expiryNote(r.trayExpiry, today) ?? ''];
      // new_lot and new_expiry stay blank: the person restocking writes them in.
      return [unit, tray, r.label, r.strength ?? 'not on tray', r.controlled ? 'yes' : 'no', ...counts, r.lotNumbers ?? '', ...onTray, '', ''];
    });
    const body = [RESTOCK_CSV_COLUMNS, ...lines].map((cells) => cells.map(csvCell).join(',')).join('\r\n') + '\r\n';
    return { filename: `restock-${slug(unit)}-${view.code.arrestAt.slice(0, 10)}.csv`, body };
  }

  async restockPdf(user: SessionUser, codeId: string): Promise<{ filename: string; body: Buffer }> {
    const { view, unitName } = this.compute(codeId);
    this.auditRestockExport(user, codeId, 'pdf', view);
    const unit = unitName ?? view.code.location ?? 'unknown unit';
    const status =
      view.status === 'signed' && view.signedAt
        ? `signed by ${view.signedBy ?? 'a pharmacist'} on ${view.signedAt.slice(0, 16).replace('T', ' ')} UTC`
        : 'DRAFT, not signed off';
    const body = await renderRestockPdf({
      facility: this.facilityName(),
      unitName: unit,
      trayName: view.tray?.name ?? 'no tray',
      codeId,
      arrestAt: view.code.arrestAt,
      location: view.code.location,
      status,
      rows: view.rows,
      printedAt: new Date().toISOString(),
    });
    return { filename: `restock-${slug(unit)}-${view.code.arrestAt.slice(0, 10)}.pdf`, body };
  }

  // ------------------------------------------------------------------ inside

  private assertOpen(code: Code): void {
    if (code.status !== 'ended') throw new ConflictException('The code has not ended: reconcile after the code ends');
    if (this.repo.findReconciliation(code.id)?.status === 'signed') {
      throw new ConflictException('This reconciliation is signed: changes go in as addenda');
    }
  }

  /** The unit's tray, else the only active tray there is. */
  private defaultTrayId(code: Code): string | null {
    const unit = this.repo.unitOf(code);
    const assigned = unit ? this.repo.trayOfUnit(unit.id) : undefined;
    if (assigned) return assigned;
    const active = this.repo.listTrays().filter((t) => t.active);
    return active.length === 1 ? (active[0]?.id ?? null) : null;
  }

  private drugTotals(codeId: string): SignedSnapshot['drugTotals'] {
    return this.codes.summary(codeId).drugTotals.map(({ drug, label, unit, total, doses }) => ({ drug, label, unit, total, doses }));
  }

  private compute(codeId: string): Computed {
    const code = this.codes.get(codeId);
    const rec = this.repo.findReconciliation(codeId);
    const unit = this.repo.unitOf(code);
    const currentTotals = this.drugTotals(codeId);
    const addenda = this.repo.addendaOf(codeId);
    const trays = this.repo.listTrays();

    let trayId: string | null;
    let trayName: string | null;
    let items: TrayItem[];
    let lines: ReconciliationLineInput[];
    let drugTotals = currentTotals;
    let recordChanged = false;
    const snapshot = rec?.status === 'signed' ? (this.repo.signedSnapshot(codeId) as SignedSnapshot | undefined) : undefined;
    if (snapshot) {
      ({ trayId, trayName, items, drugTotals } = snapshot);
      items = withCurrentLots(items, trays.find((t) => t.id === trayId)?.items ?? []);
      recordChanged = totalsKey(snapshot.drugTotals) !== totalsKey(currentTotals);
      // Addenda replace the signed line of each drug they name, in the order written.
      const byDrug = new Map(snapshot.lines.map((l) => [l.drugKey, l]));
      for (const a of addenda) for (const l of (a.changes?.lines as ReconciliationLineInput[] | undefined) ?? []) byDrug.set(l.drugKey, l);
      lines = [...byDrug.values()];
    } else {
      trayId = rec ? rec.trayId : this.defaultTrayId(code);
      const tray = trays.find((t) => t.id === trayId);
      trayName = tray?.name ?? null;
      items = tray?.items ?? [];
      lines = this.repo.linesOf(codeId);
    }
    const rows: ReconciledDrug[] = reconcileDrugs({ drugTotals, items, lines, settings: this.codes.protocolOf(code), category: code.category });
    const signatures = this.repo.signaturesOf([codeId]);
    const view: ReconciliationView = {
      code: {
        id: code.id,
        status: code.status,
        arrestAt: code.arrestAt,
        endedAt: code.endedAt,
        location: code.location,
        unitId: unit?.id ?? code.unitId,
        unitName: unit?.name ?? null,
        outcome: code.outcome,
        recordSigned: signatures.length > 0,
        signatures: signatures.map((s) => ({ printedName: s.printedName, meaning: s.meaning, signedAt: s.signedAt })),
      },
      status: rec?.status ?? 'not-started',
      tray: trayId && trayName ? { id: trayId, name: trayName } : null,
      trays: trays.filter((t) => t.active).map((t) => ({ id: t.id, name: t.name })),
      notes: rec?.notes ?? null,
      items,
      lines,
      rows,
      counts: reconciliationCounts(rows),
      updatedAt: rec?.updatedAt ?? null,
      signedBy: rec?.signedBy ? this.repo.displayName(rec.signedBy) : null,
      signedAt: rec?.signedAt ?? null,
      addenda: addenda.map((a) => ({ id: a.id, at: a.at, by: a.by, text: a.text, lines: (a.changes?.lines as ReconciliationLineInput[] | undefined) ?? [] })),
      recordChanged,
      mail: this.repo.lastPharmacyMail(codeId),
    };
    return { code, view, unitName: unit?.name ?? null };
  }

  private async mailDiscrepancies({ view, unitName }: Computed, user: SessionUser): Promise<void> {
    const where = unitName ?? view.code.location ?? 'unknown location';
    const flagged = view.rows.filter((r) => r.flagged);
    const amount = (n: number | null, r: ReconciledDrug) => (n === null || r.unit === null ? 'n/a' : `${formatAmount(n)} ${UNIT_WORDS[r.unit]}`);
    // No patient details by e-mail: where, when, and what does not add up.
    const text = [
      `The drug reconciliation of a code in ${where} was signed off by ${user.displayName} with ${flagged.length} discrepanc${flagged.length === 1 ? 'y' : 'ies'}.`,
      '',
      `Code: ${view.code.id}`,
      `Arrest recognised: ${view.code.arrestAt}`,
      `Tray: ${view.tray?.name ?? 'none'}`,
      '',
      ...flagged.flatMap((r) => [
        `- ${r.label}${r.controlled ? ' (controlled)' : ''}: given ${amount(r.given, r)}, opened ${r.unitsOpened}, wasted ${r.unitsWasted}`,
        ...r.discrepancies.filter((d) => d.kind !== 'balanced').map((d) => `    ${DISCREPANCY_WORDS[d.kind]}: ${d.message}`),
      ]),
      '',
      ...(view.notes ? ['Pharmacist notes:', view.notes, ''] : []),
      'Sign in to Steadyhand to read the reconciliation.',
    ].join('\n');
    await this.mail.send({
      to: [this.config.mail.pharmacy],
      subject: `${PHARMACY_MAIL_SUBJECT}: ${oneLine(where)}, ${view.code.arrestAt.slice(0, 10)}`,
      text,
      codeId: view.code.id,
    });
  }

  private facilityName(): string {
    return this.repo.facilityName();
  }
}

/**
 * Signed items with the lot and expiry the tray's item for that drug carries now (the restock
 * list shows what is on the cart); a drug gone from the tray keeps what was signed, if anything.
 */
function withCurrentLots(items: TrayItem[], trayNow: TrayItem[]): TrayItem[] {
  return items.map((item) => {
    const current = trayNow.find((i) => i.id === item.id) ?? trayNow.find((i) => i.drugKey === item.drugKey);
    return { ...item, lot: current ? current.lot : (item.lot ?? null), expiry: current ? current.expiry : (item.expiry ?? null) };
  });
}

// eslint-disable-next-line no-control-regex
const oneLine = (value: string) => value.replace(/[\u0000-\u001f\u007f]+/g, ' ').trim();

export const slug = (s: string) => s.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '') || 'unit';

