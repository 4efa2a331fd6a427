import type { MeUser } from '@steadyhand/shared';
import { createContext, use } from 'react';

/** Set by the signed-in guard; everything under it may assume a user. */
export const CurrentUserContext = createContext<MeUser | null>(null);

export function useCurrentUser(): MeUser {
  const user = use(CurrentUserContext);
  if (!user) throw new Error('useCurrentUser is only for pages inside the signed-in area');
  return user;
}
