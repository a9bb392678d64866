// Who is signed in. On load the app trades the refresh cookie for a session (silently — a
// returning user never sees the sign-in page); afterwards the API client reports every change.
import { createContext, useContext, useEffect, useState, type ReactNode } from 'react';
import type { SessionDto, UserDto } from '@foldfolio/shared';
import { onSessionChange, refreshSession } from '../api/client';
import { useMe } from '../api/auth';

export type AuthState =
  | { status: 'checking'; user: null }
  | { status: 'signed-out'; user: null }
  | { status: 'signed-in'; user: UserDto };

const AuthContext = createContext<AuthState>({ status: 'checking', user: null });

export function AuthProvider({ children }: { children: ReactNode }) {
  const [session, setSession] = useState<SessionDto | null | undefined>(undefined);

  useEffect(() => {
    const off = onSessionChange((s) => setSession(s));
    void refreshSession();
    return off;
  }, []);

  // /api/me is the fresh word on the user (an admin may have changed the site role)
  const me = useMe(Boolean(session));
  let state: AuthState;
  if (session === undefined) state = { status: 'checking', user: null };
  else if (session === null) state = { status: 'signed-out', user: null };
  else state = { status: 'signed-in', user: me.data ?? session.user };

  return <AuthContext.Provider value={state}>{children}</AuthContext.Provider>;
}

export function useAuth(): AuthState {
  return useContext(AuthContext);
}
