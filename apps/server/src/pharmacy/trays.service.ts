import { randomUUID } from 'node:crypto';
import { ConflictException, Inject, Injectable, NotFoundException } from '@nestjs/common';
import { trayTemplateInputSchema, type PharmacyUnit, type TrayItem, type TrayTemplate, type UnitTrayInput } from '@steadyhand/shared';
import type { z } from 'zod';
import { AuditService } from '../audit/audit.service.js';
import type { SessionUser } from '../auth/session-user.js';
import { PharmacyRepository } from './pharmacy.repository.js';

type TrayBody = z.output<typeof trayTemplateInputSchema>;

/** Tray templates (admin) and which tray each unit's cart carries. */
@Injectable()
export class TraysService {
  constructor(
    @Inject(PharmacyRepository) private readonly repo: PharmacyRepository,
    @Inject(AuditService) private readonly audit: AuditService,
  ) {}

  list(): { trays: TrayTemplate[]; units: PharmacyUnit[] } {
    return { trays: this.repo.listTrays(), units: this.repo.listUnits() };
  }

  create(user: SessionUser, body: TrayBody): TrayTemplate {
    return this.save(user, randomUUID(), body, true);
  }

  update(user: SessionUser, id: string, body: TrayBody): TrayTemplate {
    if (!this.repo.findTray(id)) throw new NotFoundException(`No tray template with id ${id}`);
    return this.save(user, id, body, false);
  }

  assign(user: SessionUser, unitId: string, body: UnitTrayInput): PharmacyUnit {
    if (!this.repo.unitExists(unitId)) throw new NotFoundException(`No unit with id ${unitId}`);
    if (body.trayId !== null && !this.repo.findTray(body.trayId)) throw new NotFoundException(`No tray template with id ${body.trayId}`);
    this.repo.assignTray(unitId, body.trayId);
    this.audit.record({ action: 'tray.assigned', userId: user.id, username: user.username, detail: { unitId, trayId: body.trayId } });
    const unit = this.repo.listUnits().find((u) => u.id === unitId);
    if (!unit) throw new NotFoundException(`No active unit with id ${unitId}`);
    return unit;
  }

  private save(user: SessionUser, id: string, body: TrayBody, isNew: boolean): TrayTemplate {
    if (this.repo.trayNameTaken(body.name, id)) throw new ConflictException(`A tray named "${body.name}" exists already`);
    const before = isNew ? [] : (this.repo.findTray(id)?.items ?? []);
    const items = body.items.map((item, index) => ({ ...item, id: item.id ?? randomUUID(), sortOrder: index }));
    this.repo.saveTray({ id, name: body.name, active: body.active, items }, new Date().toISOString(), isNew);
    const lots = lotChanges(before, items);
    this.audit.record({
      action: isNew ? 'tray.created' : 'tray.changed',
      userId: user.id,
      username: user.username,
      detail: { trayId: id, name: body.name, items: items.length, ...(lots.length ? { lots } : {}) },
    });
    const tray = this.repo.findTray(id);
    if (!tray) throw new NotFoundException(`No tray template with id ${id}`);
    return tray;
  }
}

/** Lot and expiry changes with the values they replace: which stock a cart held when is traceable. */
function lotChanges(before: TrayItem[], after: TrayItem[]): { drugKey: string; lot: string | null; expiry: string | null; was: { lot: string | null; expiry: string | null } | null }[] {
  return after.flatMap((item) => {
    const old = before.find((b) => b.id === item.id) ?? before.find((b) => b.drugKey === item.drugKey);
    if ((old?.lot ?? null) === item.lot && (old?.expiry ?? null) === item.expiry) return [];
    return [{ drugKey: item.drugKey, lot: item.lot, expiry: item.expiry, was: old ? { lot: old.lot, expiry: old.expiry } : null }];
  });
}
