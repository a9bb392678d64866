import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type {
  AcceptInvitationResult,
  InvitationDto,
  InvitationPreviewDto,
  InviteBody,
} from '@foldfolio/shared';
import { api } from './client';
import { invitationKeys, manuscriptKeys } from './keys';

const base = (manuscriptId: string) =>
  `/api/manuscripts/${encodeURIComponent(manuscriptId)}/invitations`;

export function useInvitations(manuscriptId: string, enabled = true) {
  return useQuery({
    queryKey: invitationKeys.list(manuscriptId),
    queryFn: () => api<InvitationDto[]>(base(manuscriptId)),
    enabled,
  });
}

export function useInvite(manuscriptId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: InviteBody) =>
      api<InvitationDto>(base(manuscriptId), { method: 'POST', body }),
    onSuccess: () => qc.invalidateQueries({ queryKey: invitationKeys.list(manuscriptId) }),
  });
}

export function useRevokeInvitation(manuscriptId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (invitationId: string) =>
      api<void>(`${base(manuscriptId)}/${encodeURIComponent(invitationId)}`, { method: 'DELETE' }),
    onSuccess: () => qc.invalidateQueries({ queryKey: invitationKeys.list(manuscriptId) }),
  });
}

export function useInvitationPreview(token: string) {
  return useQuery({
    queryKey: invitationKeys.preview(token),
    queryFn: () =>
      api<InvitationPreviewDto>(`/api/invitations/${encodeURIComponent(token)}`, {
        anonymous: true,
      }),
    retry: false,
  });
}

export function useAcceptInvitation(token: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () =>
      api<AcceptInvitationResult>(`/api/invitations/${encodeURIComponent(token)}/accept`, {
        method: 'POST',
      }),
    onSuccess: () =>
      Promise.all([
        qc.invalidateQueries({ queryKey: manuscriptKeys.list() }),
        qc.invalidateQueries({ queryKey: invitationKeys.preview(token) }),
      ]),
  });
}
