import { Inject, Injectable } from '@nestjs/common';
import { Passport } from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import { UsersService } from '../users/users.service.js';
import { dummyPasswordHash, verifyPassword } from './password.js';
import type { SessionUser } from './session-user.js';

/**
 * One Passport instance per app (not the module-level singleton), so several apps in one
 * process (tests, restarts) never share serializers. The session holds only the user id.
 */
@Injectable()
export class AuthPassportService {
  readonly passport = new Passport();

  constructor(@Inject(UsersService) private readonly users: UsersService) {
    this.passport.use(
      'local',
      new LocalStrategy({ session: true }, (username, password, done) => {
        this.verify(username, password).then(
          (user) => done(null, user ?? false),
          (err: unknown) => done(err),
        );
      }),
    );
    this.passport.serializeUser<string>((user, done) => done(null, user.id));
    this.passport.deserializeUser<string>((id, done) => {
      try {
        done(null, this.users.sessionUser(id) ?? false);
      } catch (err) {
        done(err);
      }
    });
  }

  /** Checks a password; unknown and disabled accounts take as long as real ones. */
  async verify(username: string, password: string): Promise<SessionUser | undefined> {
    const row = this.users.findByUsername(username.trim());
    if (!row || row.disabledAt) {
      await verifyPassword(password, await dummyPasswordHash());
      return undefined;
    }
    if (!(await verifyPassword(password, row.passwordHash))) return undefined;
    return this.users.sessionUser(row.id);
  }
}
