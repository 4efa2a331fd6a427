import { Inject, Injectable } from '@nestjs/common';
import type { Role } from '@steadyhand/shared';
import { count, eq } from 'drizzle-orm';
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

  insert(user: { id: string; username: string; displayName: string; passwordHash: string; roles: Role[] }, now: string): void {
    this.db.transaction((tx) => {
      tx.insert(users)
        .values({
          id: user.id,
          username: user.username,
          displayName: user.displayName,
          passwordHash: user.passwordHash,
          createdAt: now,
          updatedAt: now,
        })
        .run();
      for (const role of new Set(user.roles)) tx.insert(userRoles).values({ userId: user.id, role }).run();
    });
  }

  count(): number {
    return this.db.select({ n: count() }).from(users).get()?.n ?? 0;
  }
}
