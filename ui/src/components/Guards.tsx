import type { ReactNode } from 'react';
import { NonIdealState } from '@blueprintjs/core';
import { Navigate, useLocation } from 'react-router';
import { endedByUser } from '../api/client';
import { useAuth } from '../hooks/useAuth';
import { Loading } from './Loading';

export function RequireSignedIn({ children }: { children: ReactNode }) {
  const auth = useAuth();
  const location = useLocation();
  if (auth.status === 'checking') return <Loading label="Opening your session…" />;
  if (auth.status === 'signed-out') {
    if (endedByUser()) return <Navigate to="/sign-in" replace />;
    const next = location.pathname + location.search;
    return <Navigate to={`/sign-in?next=${encodeURIComponent(next)}`} replace />;
  }
  return <>{children}</>;
}

export function RequireAdmin({ children }: { children: ReactNode }) {
  const auth = useAuth();
  if (auth.status !== 'signed-in') return <RequireSignedIn>{children}</RequireSignedIn>;
  if (auth.user.siteRole !== 'admin')
    return (
      <NonIdealState
        icon="lock"
        title="Admins only"
        description="This page is for site admins. Ask an admin of this Foldfolio installation if you need access."
      />
    );
  return <>{children}</>;
}

/** Sign-in and register pages send a signed-in visitor straight on. */
export function RedirectIfSignedIn({ next, children }: { next: string; children: ReactNode }) {
  const auth = useAuth();
  if (auth.status === 'checking') return <Loading label="Opening your session…" />;
  if (auth.status === 'signed-in') return <Navigate to={next} replace />;
  return <>{children}</>;
}
