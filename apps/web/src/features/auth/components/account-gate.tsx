import type { ReactNode } from 'react';
import { Navigate, useLocation } from 'react-router';
import { paths } from '../../../config/paths';
import { useCurrentUser } from '../../../lib/session/use-current-user';

/**
 * What must happen before the page: a reset password is replaced first; an admin page needs the
 * second factor in this session (set it up, or confirm it). The server refuses the same things.
 */
export function AccountGate({ children }: { children: ReactNode }) {
  const user = useCurrentUser();
  const location = useLocation();
  const here = `${location.pathname}${location.search}`;
  if (user.mustChangePassword && location.pathname !== paths.account.password.path) {
    return <Navigate to={paths.account.password.getHref(here)} replace />;
  }
  const adminPage = location.pathname === paths.admin.area.path || location.pathname.startsWith(`${paths.admin.area.path}/`);
  if (adminPage && user.roles.includes('admin') && user.secondFactor && !user.secondFactor.satisfied) {
    return <Navigate to={paths.account.secondFactor.getHref(here)} replace />;
  }
  return children;
}
