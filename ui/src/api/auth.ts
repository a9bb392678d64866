import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type {
  PasswordResetConfirmBody,
  PasswordResetRequestBody,
  RegisterBody,
  SessionDto,
  SignInBody,
  UserDto,
} from '@foldfolio/shared';
import { useNavigate } from 'react-router';
import { api, setSession } from './client';
import { meKeys } from './keys';

export function useMe(enabled: boolean) {
  return useQuery({
    queryKey: meKeys.all,
    queryFn: () => api<UserDto>('/api/auth/me'),
    enabled,
  });
}

export function useSignIn() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: SignInBody) =>
      api<SessionDto>('/api/auth/sign-in', { method: 'POST', body, anonymous: true }),
    onSuccess: (session) => {
      // a different person may sign in in the same tab: nothing cached may leak across
      qc.clear();
      setSession(session);
    },
  });
}

export function useRegister() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: async (body: RegisterBody): Promise<SessionDto> => {
      const created = await api<Partial<SessionDto> & { user?: UserDto }>('/api/auth/register', {
        method: 'POST',
        body,
        anonymous: true,
      });
      if (created && typeof created.accessToken === 'string' && created.user)
        return created as SessionDto;
      // registration that does not open a session: sign in with the same credentials
      return api<SessionDto>('/api/auth/sign-in', {
        method: 'POST',
        body: { email: body.email, password: body.password },
        anonymous: true,
      });
    },
    onSuccess: (session) => {
      qc.clear();
      setSession(session);
    },
  });
}

/**
 * Ends the session on the server and here. Inside the signed-in area the route guard then shows
 * the sign-in page; a public page may pass where to go instead (`to`). The navigation lives in
 * the mutation itself because a caller's own callbacks never run once it has unmounted.
 */
export function useSignOut() {
  const qc = useQueryClient();
  const navigate = useNavigate();
  return useMutation({
    mutationFn: async (_to: string | undefined) => {
      await api<void>('/api/auth/sign-out', { method: 'POST' });
    },
    // sign out locally even when the server call fails: the user asked to leave
    onSettled: (_data, _err, to) => {
      setSession(null, true);
      qc.clear();
      if (to) void navigate(to, { replace: true });
    },
  });
}

export function useRequestPasswordReset() {
  return useMutation({
    mutationFn: (body: PasswordResetRequestBody) =>
      api<void>('/api/auth/password-reset', { method: 'POST', body, anonymous: true }),
  });
}

export function useConfirmPasswordReset() {
  return useMutation({
    mutationFn: (body: PasswordResetConfirmBody) =>
      api<void>('/api/auth/password-reset/confirm', { method: 'POST', body, anonymous: true }),
  });
}
