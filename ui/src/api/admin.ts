import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type {
  AdminUserDto,
  ChangeSiteRoleBody,
  MailMessageDto,
  MailMessageSummaryDto,
  SiteRole,
} from '@foldfolio/shared';
import { api } from './client';
import { adminKeys, meKeys } from './keys';

export function useAdminUsers() {
  return useQuery({
    queryKey: adminKeys.users(),
    queryFn: () => api<AdminUserDto[]>('/api/admin/users'),
  });
}

export function useChangeSiteRole() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, siteRole }: { id: string; siteRole: SiteRole }) =>
      api<AdminUserDto>(`/api/admin/users/${encodeURIComponent(id)}`, {
        method: 'PATCH',
        body: { siteRole } satisfies ChangeSiteRoleBody,
      }),
    // an admin may demote themself, which changes what /api/me says
    onSuccess: () =>
      Promise.all([
        qc.invalidateQueries({ queryKey: adminKeys.users() }),
        qc.invalidateQueries({ queryKey: meKeys.all }),
      ]),
  });
}

export function useOutbox() {
  return useQuery({
    queryKey: adminKeys.outbox(),
    queryFn: () => api<MailMessageSummaryDto[]>('/api/admin/outbox'),
    // mail arrives from the service's own SMTP sink while the page is open
    refetchInterval: 10_000,
  });
}

export function useOutboxMessage(id: string) {
  return useQuery({
    queryKey: adminKeys.message(id),
    queryFn: () => api<MailMessageDto>(`/api/admin/outbox/${encodeURIComponent(id)}`),
  });
}

export function useDeleteUser() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (id: string) =>
      api<void>(`/api/admin/users/${encodeURIComponent(id)}`, { method: 'DELETE' }),
    onSuccess: () => qc.invalidateQueries({ queryKey: adminKeys.users() }),
  });
}
