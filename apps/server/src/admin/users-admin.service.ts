import { ConflictException, Inject, Injectable, NotFoundException } from '@nestjs/common';
import type { AdminUser, CreateUserRequest, Role } from '@steadyhand/shared';
import { AuditService } from '../audit/audit.service.js';
import { SessionDirectoryService } from '../auth/session-directory.service.js';
import { SessionService } from '../auth/session.service.js';
import type { SessionUser } from '../auth/session-user.js';
import { TotpService } from '../auth/totp.service.js';
import { UsersService, type UserRow } from '../users/users.service.js';

const LAST_ADMIN = 'This is the last enabled administrator: give someone else the administrator role first';

/** People and their roles, run by an admin. Every change is in the audit trail. */
@Injectable()
export class UsersAdminService {
  constructor(
    @Inject(UsersService) private readonly users: UsersService,
    @Inject(SessionService) private readonly sessions: SessionService,
    @Inject(SessionDirectoryService) private readonly directory: SessionDirectoryService,
    @Inject(TotpService) private readonly totp: TotpService,
    @Inject(AuditService) private readonly audit: AuditService,
  ) {}

  list(): AdminUser[] {
    const open = new Map<string, number>();
    for (const s of this.directory.list('')) open.set(s.userId, (open.get(s.userId) ?? 0) + 1);
    return this.users.list().map((u) => this.toAdminUser(u, open.get(u.id) ?? 0));
  }

  private toAdminUser(u: UserRow, activeSessions = 0): AdminUser {
    return {
      id: u.id,
      username: u.username,
      displayName: u.displayName,
      roles: u.roles,
      disabledAt: u.disabledAt,
      mustChangePassword: u.mustChangePassword,
      secondFactor: this.totp.isEnabled(u.id),
      createdAt: u.createdAt,
      activeSessions,
    };
  }

  private get(id: string): UserRow {
    const u = this.users.findById(id);
    if (!u) throw new NotFoundException('No such person');
    return u;
  }

  private record(actor: SessionUser, action: string, target: UserRow, detail: Record<string, unknown> = {}): void {
    this.audit.record({ action, userId: actor.id, username: actor.username, detail: { id: target.id, username: target.username, ...detail } });
  }

  /** A new person chooses their own password at first sign-in: the admin knows this one. */
  async create(actor: SessionUser, body: CreateUserRequest): Promise<AdminUser> {
    const created = await this.users.create({ ...body, mustChangePassword: true }, { userId: actor.id, username: actor.username });
    return this.toAdminUser(this.get(created.id));
  }

  rename(actor: SessionUser, id: string, displayName: string): AdminUser {
    const before = this.get(id);
    this.users.update(id, { displayName });
    this.record(actor, 'user.renamed', before, { from: before.displayName, to: displayName });
    return this.toAdminUser(this.get(id));
  }

  setRoles(actor: SessionUser, id: string, roles: Role[]): AdminUser {
    const before = this.get(id);
    const next = [...new Set(roles)].sort();
    if (before.roles.includes('admin') && !next.includes('admin') && !before.disabledAt && this.users.countEnabledAdmins(id) === 0) {
      throw new ConflictException(LAST_ADMIN);
    }
    this.users.setRoles(id, next);
    this.record(actor, 'user.roles-changed', before, { from: before.roles, to: next });
    return this.toAdminUser(this.get(id));
  }

  /** The person must choose their own password at next sign-in; their open sessions end now. */
  async resetPassword(actor: SessionUser, id: string, password: string): Promise<AdminUser> {
    const target = this.get(id);
    await this.users.setPassword(id, password, true);
    this.sessions.endAllForUser(id);
    this.record(actor, 'user.password-reset', target);
    return this.toAdminUser(this.get(id));
  }

  /** Ends every session and live socket of the person at once. */
  disable(actor: SessionUser, id: string): AdminUser {
    const target = this.get(id);
    if (target.id === actor.id) throw new ConflictException('You cannot disable your own account');
    if (!target.disabledAt) {
      if (target.roles.includes('admin') && this.users.countEnabledAdmins(id) === 0) throw new ConflictException(LAST_ADMIN);
      this.users.update(id, { disabledAt: new Date().toISOString() });
      this.sessions.userDisabled(id);
      this.record(actor, 'user.disabled', target);
    }
    return this.toAdminUser(this.get(id));
  }

  enable(actor: SessionUser, id: string): AdminUser {
    const target = this.get(id);
    if (target.disabledAt) {
      this.users.update(id, { disabledAt: null });
      this.record(actor, 'user.enabled', target);
    }
    return this.toAdminUser(this.get(id));
  }

  /** For a lost phone: the person sets up a new authenticator at next sign-in. */
  resetSecondFactor(actor: SessionUser, id: string): AdminUser {
    const target = this.get(id);
    if (this.totp.reset(id)) {
      this.sessions.endAllForUser(id);
      this.record(actor, 'user.second-factor-reset', target);
    }
    return this.toAdminUser(this.get(id));
  }
}
