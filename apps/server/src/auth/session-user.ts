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
    /** The password was right; the sign-in waits for the second factor (nobody is signed in yet). */
    pendingSecondFactor?: { userId: string; since: number };
    /** When this session passed the second factor (epoch ms); admin routes need it. */
    secondFactorAt?: number;
  }
}

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type
    interface User extends SessionUser {}
  }
}
