import { randomUUID } from 'node:crypto';
import { ConflictException, Inject, Injectable } from '@nestjs/common';
import { newPasswordSchema, usernameSchema, type PublicUser, type Role } from '@steadyhand/shared';
import { assertNotCommonPassword } from '../auth/common-passwords.js';
import { hashPassword } from '../auth/password.js';
import type { SessionUser } from '../auth/session-user.js';
import { AuditService } from '../audit/audit.service.js';
import { UsersRepository, type UserRow } from './users.repository.js';

export type { UserRow };

export function toPublicUser(u: Pick<UserRow, 'id' | 'username' | 'displayName' | 'roles'>): PublicUser {
  return { id: u.id, username: u.username, displayName: u.displayName, roles: u.roles };
}

@Injectable()
export class UsersService {
  constructor(
    @Inject(UsersRepository) private readonly repo: UsersRepository,
    @Inject(AuditService) private readonly audit: AuditService,
  ) {}

  findById(id: string): UserRow | undefined {
    return this.repo.findById(id);
  }

  findByUsername(username: string): UserRow | undefined {
    return this.repo.findByUsername(username);
  }

  /** The person behind a session, or undefined when they no longer exist or were disabled. */
  sessionUser(id: string): SessionUser | undefined {
    const u = this.repo.findById(id);
    if (!u || u.disabledAt) return undefined;
    return { ...toPublicUser(u), mustChangePassword: u.mustChangePassword };
  }

  async create(
    input: { username: string; displayName: string; password: string; roles: Role[]; mustChangePassword?: boolean },
    actor: { userId: string | null; username: string | null },
  ): Promise<PublicUser> {
    const username = usernameSchema.parse(input.username);
    const password = newPasswordSchema.parse(input.password);
    assertNotCommonPassword(password);
    if (this.repo.findByUsername(username)) throw new ConflictException(`A user named ${username} already exists`);
    const id = randomUUID();
    const passwordHash = await hashPassword(password);
    this.repo.insert(
      { id, username, displayName: input.displayName.trim(), passwordHash, roles: input.roles, mustChangePassword: input.mustChangePassword },
      new Date().toISOString(),
    );
    this.audit.record({ action: 'user.created', userId: actor.userId, username: actor.username, detail: { id, username, roles: input.roles } });
    return { id, username, displayName: input.displayName.trim(), roles: [...new Set(input.roles)].sort() };
  }

  /** Everyone, for the admin's people screen. */
  list(): UserRow[] {
    return this.repo.list();
  }

  /** Name, password hash, must-change flag or disabled time (the admin's and the person's own changes). */
  update(id: string, values: Parameters<UsersRepository['update']>[1]): void {
    this.repo.update(id, values);
  }

  setRoles(id: string, roles: Role[]): void {
    this.repo.setRoles(id, roles);
  }

  /** Enabled admins, leaving one person out: the last admin cannot be disabled or demoted. */
  countEnabledAdmins(exceptUserId?: string): number {
    return this.repo.countEnabledAdmins(exceptUserId);
  }

  count(): number {
    return this.repo.count();
  }

  /** Sets a new password (already checked by the caller); `mustChange` makes them choose another at next sign-in. */
  async setPassword(id: string, password: string, mustChange: boolean): Promise<void> {
    assertNotCommonPassword(password);
    this.repo.update(id, { passwordHash: await hashPassword(password), mustChangePassword: mustChange });
  }
}
