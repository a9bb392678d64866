import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { ChangeRoleBody, MemberDto, MembershipRole } from '@foldfolio/shared';
import { api } from './client';
import { manuscriptKeys, memberKeys } from './keys';

const base = (manuscriptId: string) =>
  `/api/manuscripts/${encodeURIComponent(manuscriptId)}/members`;

export function useMembers(manuscriptId: string) {
  return useQuery({
    queryKey: memberKeys.list(manuscriptId),
    queryFn: () => api<MemberDto[]>(base(manuscriptId)),
  });
}

export function useChangeMemberRole(manuscriptId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ userId, role }: { userId: string; role: MembershipRole }) =>
      api<MemberDto>(`${base(manuscriptId)}/${encodeURIComponent(userId)}`, {
        method: 'PATCH',
        body: { role } satisfies ChangeRoleBody,
      }),
    // the caller's own role may be the one that changed, so the manuscript itself is stale too
    onSuccess: () =>
      Promise.all([
        qc.invalidateQueries({ queryKey: memberKeys.list(manuscriptId) }),
        qc.invalidateQueries({ queryKey: manuscriptKeys.detail(manuscriptId) }),
        qc.invalidateQueries({ queryKey: manuscriptKeys.list() }),
      ]),
  });
}

/** An owner removes someone else. */
export function useRemoveMember(manuscriptId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (userId: string) =>
      api<void>(`${base(manuscriptId)}/${encodeURIComponent(userId)}`, { method: 'DELETE' }),
    onSuccess: () =>
      Promise.all([
        qc.invalidateQueries({ queryKey: memberKeys.list(manuscriptId) }),
        // member counts on the Desk change
        qc.invalidateQueries({ queryKey: manuscriptKeys.list() }),
      ]),
  });
}

/** Leaving is its own route: any member may leave, the last owner may not. */
export function useLeaveManuscript(manuscriptId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () =>
      api<void>(`/api/manuscripts/${encodeURIComponent(manuscriptId)}/leave`, { method: 'POST' }),
    onSuccess: () => {
      // the manuscript is no longer ours to read: drop its cached detail and members
      qc.removeQueries({ queryKey: manuscriptKeys.detail(manuscriptId) });
      qc.removeQueries({ queryKey: memberKeys.list(manuscriptId) });
      return qc.invalidateQueries({ queryKey: manuscriptKeys.list() });
    },
  });
}
