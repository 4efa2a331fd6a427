import { randomUUID } from 'node:crypto';
import { ConflictException, Inject, Injectable, NotFoundException } from '@nestjs/common';
import type { PlaceUnit, Places } from '@steadyhand/shared';
import { asc, count, eq } from 'drizzle-orm';
import { AuditService } from '../audit/audit.service.js';
import type { SessionUser } from '../auth/session-user.js';
import { DB } from '../db/database.module.js';
import type { Db } from '../db/database.js';
import { beds, rooms, settings, units } from '../db/schema/index.js';

const FACILITY_KEY = 'facility';
const DEFAULT_FACILITY = 'Our hospital';

/**
 * The facility name, units, rooms and beds that the start-code picker and the record use. Units
 * are deactivated, never deleted, because old codes point at them; rooms and beds hold no
 * history (a code keeps its location as text), so an empty one may go.
 */
@Injectable()
export class PlacesService {
  constructor(
    @Inject(DB) private readonly db: Db,
    @Inject(AuditService) private readonly audit: AuditService,
  ) {}

  facilityName(): string {
    const row = this.db.select().from(settings).where(eq(settings.key, FACILITY_KEY)).get();
    const value = row?.value as { name?: unknown } | undefined;
    return typeof value?.name === 'string' ? value.name : DEFAULT_FACILITY;
  }

  all(activeOnly: boolean): Places {
    const unitRows = this.db.select().from(units).orderBy(asc(units.name)).all();
    const roomRows = this.db.select().from(rooms).orderBy(asc(rooms.name)).all();
    const bedRows = this.db.select().from(beds).orderBy(asc(beds.name)).all();
    const byNumber = (a: { name: string }, b: { name: string }) => a.name.localeCompare(b.name, undefined, { numeric: true });
    const list: PlaceUnit[] = unitRows
      .filter((u) => !activeOnly || u.active)
      .map((u) => ({
        id: u.id,
        name: u.name,
        active: u.active,
        rooms: roomRows
          .filter((r) => r.unitId === u.id)
          .sort(byNumber)
          .map((r) => ({ id: r.id, name: r.name, beds: bedRows.filter((b) => b.roomId === r.id).sort(byNumber).map((b) => ({ id: b.id, name: b.name })) })),
      }));
    return { facility: { name: this.facilityName() }, units: list };
  }

  private record(actor: SessionUser, action: string, detail: Record<string, unknown>): void {
    this.audit.record({ action, userId: actor.id, username: actor.username, detail });
  }

  setFacility(actor: SessionUser, name: string): Places {
    const from = this.facilityName();
    const now = new Date().toISOString();
    const values = { value: { name }, updatedAt: now, updatedBy: actor.id };
    this.db.insert(settings).values({ key: FACILITY_KEY, ...values }).onConflictDoUpdate({ target: settings.key, set: values }).run();
    this.record(actor, 'places.facility-renamed', { from, to: name });
    return this.all(false);
  }

  private unit(id: string) {
    const row = this.db.select().from(units).where(eq(units.id, id)).get();
    if (!row) throw new NotFoundException('No such unit');
    return row;
  }

  private room(id: string) {
    const row = this.db.select().from(rooms).where(eq(rooms.id, id)).get();
    if (!row) throw new NotFoundException('No such room');
    return row;
  }

  private bed(id: string) {
    const row = this.db.select().from(beds).where(eq(beds.id, id)).get();
    if (!row) throw new NotFoundException('No such bed');
    return row;
  }

  private assertFreeUnitName(name: string, exceptId?: string): void {
    const clash = this.db.select().from(units).where(eq(units.name, name)).get();
    if (clash && clash.id !== exceptId) throw new ConflictException(`A unit named ${name} exists already`);
  }

  addUnit(actor: SessionUser, name: string): Places {
    this.assertFreeUnitName(name);
    const id = randomUUID();
    this.db.insert(units).values({ id, name, createdAt: new Date().toISOString() }).run();
    this.record(actor, 'places.unit-added', { id, name });
    return this.all(false);
  }

  updateUnit(actor: SessionUser, id: string, patch: { name?: string; active?: boolean }): Places {
    const before = this.unit(id);
    if (patch.name !== undefined) this.assertFreeUnitName(patch.name, id);
    this.db.update(units).set(patch).where(eq(units.id, id)).run();
    this.record(actor, 'places.unit-changed', { id, from: { name: before.name, active: before.active }, to: patch });
    return this.all(false);
  }

  addRoom(actor: SessionUser, unitId: string, name: string): Places {
    const unit = this.unit(unitId);
    const id = randomUUID();
    this.db.insert(rooms).values({ id, unitId, name, createdAt: new Date().toISOString() }).run();
    this.record(actor, 'places.room-added', { id, name, unit: unit.name });
    return this.all(false);
  }

  renameRoom(actor: SessionUser, id: string, name: string): Places {
    const before = this.room(id);
    this.db.update(rooms).set({ name }).where(eq(rooms.id, id)).run();
    this.record(actor, 'places.room-renamed', { id, from: before.name, to: name });
    return this.all(false);
  }

  removeRoom(actor: SessionUser, id: string): Places {
    const room = this.room(id);
    const bedCount = this.db.select({ n: count() }).from(beds).where(eq(beds.roomId, id)).get()?.n ?? 0;
    if (bedCount > 0) throw new ConflictException('Remove the beds in this room first');
    this.db.delete(rooms).where(eq(rooms.id, id)).run();
    this.record(actor, 'places.room-removed', { id, name: room.name });
    return this.all(false);
  }

  addBed(actor: SessionUser, roomId: string, name: string): Places {
    const room = this.room(roomId);
    const id = randomUUID();
    this.db.insert(beds).values({ id, roomId, name, createdAt: new Date().toISOString() }).run();
    this.record(actor, 'places.bed-added', { id, name, room: room.name });
    return this.all(false);
  }

  renameBed(actor: SessionUser, id: string, name: string): Places {
    const before = this.bed(id);
    this.db.update(beds).set({ name }).where(eq(beds.id, id)).run();
    this.record(actor, 'places.bed-renamed', { id, from: before.name, to: name });
    return this.all(false);
  }

  removeBed(actor: SessionUser, id: string): Places {
    const bed = this.bed(id);
    this.db.delete(beds).where(eq(beds.id, id)).run();
    this.record(actor, 'places.bed-removed', { id, name: bed.name });
    return this.all(false);
  }
}
