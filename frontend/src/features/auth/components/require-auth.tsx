import { CircularProgress, Stack } from '@mui/material';
import type { ReactNode } from 'react';
import { Navigate, useLocation } from 'react-router-dom';
import { useMe, type Role } from '../api/get-me';

/**
 * Guards a page: signed-out visitors go to sign-in and come back here afterwards; a signed-in user
 * without one of the roles sees why. The server enforces the same rules on every request.
 */
export function RequireAuth({ roles, children }: { roles?: Role[]; children: ReactNode }) {
  const { data: me, isPending } = useMe();
  const location = useLocation();
  if (isPending) {
    return (
      <Stack sx={{ alignItems: 'center', py: 6 }}>
        <CircularProgress aria-label="Loading" />
      </Stack>
    );
  }
  if (!me) return <Navigate to={`/sign-in?next=${encodeURIComponent(location.pathname + location.search)}`} replace />;
  if (roles && !roles.some((r) => me.roles.includes(r))) {
    return <Navigate to="/no-access" replace state={{ from: location.pathname }} />;
  }
  return <>{children}</>;
}
