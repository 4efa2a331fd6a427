import type { Role } from '@steadyhand/shared';

/** The signed-in person as every request sees them (loaded fresh from the database each time). */
export interface SessionUser {
  id: string;
  username: string;
  displayName: string;
  roles: Role[];
  mustChangePassword: boolean;
}

declare module 'express-session' {
  interface SessionData {
    csrfToken?: string;
    /** When the person signed in (epoch ms), for the absolute timeout. */
    signedInAt?: number;
    passport?: { user?: string };
  }
}

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type
    interface User extends SessionUser {}
  }
}
