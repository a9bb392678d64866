import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { CreateManuscriptBody, ManuscriptDto, RenameManuscriptBody } from '@foldfolio/shared';
import { api } from './client';
import { manuscriptKeys } from './keys';

const base = (id: string) => `/api/manuscripts/${encodeURIComponent(id)}`;

export function useManuscripts() {
  return useQuery({
    queryKey: manuscriptKeys.list(),
    queryFn: () => api<ManuscriptDto[]>('/api/manuscripts?includeArchived=true'),
  });
}

export function useManuscript(id: string) {
  return useQuery({
    queryKey: manuscriptKeys.detail(id),
    queryFn: () => api<ManuscriptDto>(base(id)),
  });
}

export function useCreateManuscript() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateManuscriptBody) =>
      api<ManuscriptDto>('/api/manuscripts', { method: 'POST', body }),
    onSuccess: () => qc.invalidateQueries({ queryKey: manuscriptKeys.list() }),
  });
}

export function useRenameManuscript(id: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: RenameManuscriptBody) =>
      api<ManuscriptDto>(base(id), { method: 'PATCH', body }),
    onSuccess: () =>
      Promise.all([
        qc.invalidateQueries({ queryKey: manuscriptKeys.detail(id) }),
        qc.invalidateQueries({ queryKey: manuscriptKeys.list() }),
      ]),
  });
}

export function useSetArchived(id: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (archived: boolean) =>
      api<ManuscriptDto>(`${base(id)}/${archived ? 'archive' : 'restore'}`, { method: 'POST' }),
    onSuccess: () =>
      Promise.all([
        qc.invalidateQueries({ queryKey: manuscriptKeys.detail(id) }),
        qc.invalidateQueries({ queryKey: manuscriptKeys.list() }),
      ]),
  });
}
