import { Inject, Injectable } from '@nestjs/common';
import type { Role } from '@steadyhand/shared';
import { and, asc, count, eq, isNull, ne } from 'drizzle-orm';
import { DB } from '../db/database.module.js';
import type { Db } from '../db/database.js';
import { userRoles, users } from '../db/schema/index.js';

export interface UserRow {
  id: string;
  username: string;
  displayName: string;
  passwordHash: string;
  mustChangePassword: boolean;
  disabledAt: string | null;
  createdAt: string;
  roles: Role[];
}

@Injectable()
export class UsersRepository {
  constructor(@Inject(DB) private readonly db: Db) {}

  findById(id: string): UserRow | undefined {
    const row = this.db.select().from(users).where(eq(users.id, id)).get();
    return row && { ...row, roles: this.rolesOf(row.id) };
  }

  findByUsername(username: string): UserRow | undefined {
    const row = this.db.select().from(users).where(eq(users.username, username)).get();
    return row && { ...row, roles: this.rolesOf(row.id) };
  }

  private rolesOf(userId: string): Role[] {
    return this.db
      .select({ role: userRoles.role })
      .from(userRoles)
      .where(eq(userRoles.userId, userId))
      .all()
      .map((r) => r.role)
      .sort();
  }

  insert(user: { id: string; username: string; displayName: string; passwordHash: string; roles: Role[]; mustChangePassword?: boolean }, now: string): void {
    this.db.transaction((tx) => {
      tx.insert(users)
        .values({
          id: user.id,
          username: user.username,
          displayName: user.displayName,
          passwordHash: user.passwordHash,
          mustChangePassword: user.mustChangePassword ?? false,
          createdAt: now,
          updatedAt: now,
        })
        .run();
      for (const role of new Set(user.roles)) tx.insert(userRoles).values({ userId: user.id, role }).run();
    });
  }

  list(): UserRow[] {
    const roleRows = this.db.select().from(userRoles).all();
    return this.db
      .select()
      .from(users)
      .orderBy(asc(users.displayName))
      .all()
      .map((u) => ({ ...u, roles: roleRows.filter((r) => r.userId === u.id).map((r) => r.role).sort() }));
  }

  update(id: string, values: Partial<{ displayName: string; passwordHash: string; mustChangePassword: boolean; disabledAt: string | null }>): void {
    this.db.update(users).set({ ...values, updatedAt: new Date().toISOString() }).where(eq(users.id, id)).run();
  }

  setRoles(id: string, roles: Role[]): void {
    this.db.transaction((tx) => {
      tx.delete(userRoles).where(eq(userRoles.userId, id)).run();
      for (const role of new Set(roles)) tx.insert(userRoles).values({ userId: id, role }).run();
      tx.update(users).set({ updatedAt: new Date().toISOString() }).where(eq(users.id, id)).run();
    });
  }

  /** Enabled accounts holding the admin role, leaving one person out. */
  countEnabledAdmins(exceptUserId?: string): number {
    const conditions = [eq(userRoles.role, 'admin'), isNull(users.disabledAt)];
    if (exceptUserId) conditions.push(ne(users.id, exceptUserId));
    return (
      this.db
        .select({ n: count() })
        .from(users)
        .innerJoin(userRoles, eq(userRoles.userId, users.id))
        .where(and(...conditions))
        .get()?.n ?? 0
    );
  }

  count(): number {
    return this.db.select({ n: count() }).from(users).get()?.n ?? 0;
  }
}
