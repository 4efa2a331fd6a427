import { ConflictException, Inject, Injectable, NotFoundException } from '@nestjs/common';
import { CART_RESTOCK_CSV_COLUMNS, CART_RESTOCK_DEFAULT_DAYS, csvCell, sumCartRestock, type CartRestock, type CartRestockCodeInput } from '@steadyhand/shared';
import { AuditService } from '../audit/audit.service.js';
import type { SessionUser } from '../auth/session-user.js';
import { PharmacyRepository } from './pharmacy.repository.js';
import { ReconciliationService, slug } from './reconciliation.service.js';
import { renderCartRestockPdf } from './restock-pdf.js';

/** One restock list per cart: every code on the unit since a date, signed-off reconciliations summed. */
@Injectable()
export class CartRestockService {
  constructor(
    @Inject(PharmacyRepository) private readonly repo: PharmacyRepository,
    @Inject(ReconciliationService) private readonly reconciliation: ReconciliationService,
    @Inject(AuditService) private readonly audit: AuditService,
  ) {}

  restock(unitId: string, since: string | undefined): CartRestock {
    const unit = this.repo.findUnit(unitId);
    if (!unit) throw new NotFoundException(`No unit with id ${unitId}`);
    const trayId = this.repo.trayOfUnit(unitId);
    const tray = trayId ? this.repo.findTray(trayId) : undefined;
    if (!tray) throw new ConflictException(`The ${unit.name} cart has no tray template: an admin puts one on it on the Trays page`);
    const now = new Date();
    const from = `${since ?? defaultSince(now)}T00:00:00.000Z`;
    const codes = this.repo.codesOfUnitSince(unitId, from).map((code): CartRestockCodeInput => {
      // A running code has nothing reconciled yet; the rest read as on the reconciliation page.
      const view = code.status === 'ended' ? this.reconciliation.viewOf(code.id) : undefined;
      return {
        codeId: code.id,
        arrestAt: code.arrestAt,
        location: code.location,
        codeStatus: code.status,
        status: view?.status ?? 'not-started',
        tray: view?.tray ?? null,
        rows: view?.rows ?? [],
      };
    });
    const sum = sumCartRestock({ tray, codes, today: now.toISOString().slice(0, 10) });
    return { unit, tray: { id: tray.id, name: tray.name }, since: from, until: now.toISOString(), ...sum };
  }

  csv(user: SessionUser, unitId: string, since: string | undefined): { filename: string; body: string } {
    const restock = this.restock(unitId, since);
    const rows = restock.lines.map((l) => {
      const counts = [l.par ?? '', l.unitsOpened, l.unitsWasted, l.restock];
      const onTray = [l.trayLot ?? '', l.trayExpiry ?? '', l.expiryNote ?? ''];
      // new_lot and new_expiry stay blank for the person restocking, as on the per-code list.
      return [restock.unit.name, restock.tray.name, l.label, l.strength ?? 'not on tray', l.controlled ? 'yes' : 'no', ...counts, l.lotsUsed.join('; '), ...onTray, '', '', l.codeIds.join(' ')];
    });
    const body = [CART_RESTOCK_CSV_COLUMNS, ...rows].map((cells) => cells.map(csvCell).join(',')).join('\r\n') + '\r\n';
    this.audited(user, restock, 'csv');
    return { filename: `${fileStem(restock)}.csv`, body };
  }

  async pdf(user: SessionUser, unitId: string, since: string | undefined): Promise<{ filename: string; body: Buffer }> {
    const restock = this.restock(unitId, since);
    const body = await renderCartRestockPdf({ facility: this.repo.facilityName(), restock, printedAt: new Date().toISOString() });
    this.audited(user, restock, 'pdf');
    return { filename: `${fileStem(restock)}.pdf`, body };
  }

  /** Which codes went into an exported list, for the audit trail (as the quality exports are). */
  private audited(user: SessionUser, restock: CartRestock, format: 'csv' | 'pdf'): void {
    this.audit.record({
      action: 'pharmacy.export-cart-restock',
      userId: user.id,
      username: user.username,
      detail: {
        format,
        unitId: restock.unit.id,
        trayId: restock.tray.id,
        since: restock.since,
        until: restock.until,
        codes: restock.included.map((c) => c.codeId),
        leftOut: restock.leftOut.map((c) => ({ codeId: c.codeId, reason: c.reason })),
        lines: restock.lines.length,
      },
    });
  }
}

function defaultSince(now: Date): string {
  const since = new Date(now);
  since.setUTCDate(since.getUTCDate() - CART_RESTOCK_DEFAULT_DAYS);
  return since.toISOString().slice(0, 10);
}

const fileStem = (r: CartRestock) => `restock-cart-${slug(r.unit.name)}-since-${r.since.slice(0, 10)}`;
