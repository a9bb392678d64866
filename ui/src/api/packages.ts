// Hooks for review packages (issue 7): build, list, download, reviewer links, audit log, the
// public reviewer page and the verify upload.
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type {
  CreatedReviewLinkDto,
  CreatePackageBody,
  CreateReviewLinkBody,
  PackageAuditEventDto,
  ReviewerPackageDto,
  ReviewLinkDto,
  ReviewPackageDto,
  VerifyResultDto,
} from '@foldfolio/shared';
import { ApiError, api, authorizationHeader, refreshSession } from './client';

const base = (m: string) => `/api/manuscripts/${encodeURIComponent(m)}`;

export const packageKeys = {
  list: (m: string) => ['packages', m] as const,
  audit: (m: string) => ['packages', m, 'audit'] as const,
  reviewer: (token: string) => ['review', token] as const,
};

const building = (p: ReviewPackageDto) => p.status === 'queued' || p.status === 'building';

/** Packages, newest first; polls every second while one is being built. */
export function usePackages(manuscriptId: string) {
  return useQuery({
    queryKey: packageKeys.list(manuscriptId),
    queryFn: () => api<ReviewPackageDto[]>(`${base(manuscriptId)}/packages`),
    refetchInterval: (q) => (q.state.data?.some(building) ? 1000 : false),
  });
}

export function useBuildPackage(manuscriptId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: CreatePackageBody) =>
      api<ReviewPackageDto>(`${base(manuscriptId)}/packages`, { method: 'POST', body }),
    onSuccess: () => qc.invalidateQueries({ queryKey: packageKeys.list(manuscriptId) }),
  });
}

export function useCreateLink(manuscriptId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ packageId, body }: { packageId: string; body: CreateReviewLinkBody }) =>
      api<CreatedReviewLinkDto>(
        `${base(manuscriptId)}/packages/${encodeURIComponent(packageId)}/links`,
        { method: 'POST', body },
      ),
    onSuccess: () => qc.invalidateQueries({ queryKey: packageKeys.list(manuscriptId) }),
  });
}

export function useRevokeLink(manuscriptId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (linkId: string) =>
      api<ReviewLinkDto>(
        `${base(manuscriptId)}/review-links/${encodeURIComponent(linkId)}/revoke`,
        { method: 'POST' },
      ),
    onSuccess: () => {
      void qc.invalidateQueries({ queryKey: packageKeys.list(manuscriptId) });
      void qc.invalidateQueries({ queryKey: packageKeys.audit(manuscriptId) });
    },
  });
}

export function usePackageAudit(manuscriptId: string, enabled: boolean) {
  return useQuery({
    queryKey: packageKeys.audit(manuscriptId),
    queryFn: () => api<PackageAuditEventDto[]>(`${base(manuscriptId)}/package-audit`),
    enabled,
  });
}

/** Saves a blob under a file name through a temporary object URL. */
function save(blob: Blob, filename: string): void {
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = filename;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

/** The member download needs the bearer token, so it goes through fetch, not a plain link. */
export async function downloadPackage(manuscriptId: string, packageId: string): Promise<void> {
  const path = `${base(manuscriptId)}/packages/${encodeURIComponent(packageId)}/zip`;
  const get = () => {
    const auth = authorizationHeader();
    return fetch(path, { headers: auth ? { Authorization: auth } : {}, credentials: 'include' });
  };
  let res = await get();
  if (res.status === 401 && (await refreshSession())) res = await get();
  if (!res.ok) {
    let message = 'The package could not be downloaded. Reload the tab and try again.';
    try {
      const body = (await res.json()) as { message?: string };
      if (body.message) message = body.message;
    } catch {
      // keep the sentence above
    }
    throw new ApiError(res.status, message);
  }
  save(await res.blob(), `review-package-${packageId.slice(0, 8)}.zip`);
}

/** The reviewer's view of a link (no sign-in). */
export function useReviewerPackage(token: string) {
  return useQuery({
    queryKey: packageKeys.reviewer(token),
    queryFn: () =>
      api<ReviewerPackageDto>(`/api/review/${encodeURIComponent(token)}`, { anonymous: true }),
    retry: false,
    staleTime: Infinity,
  });
}

export function reviewerFileUrl(token: string, path: string): string {
  return `/api/review/${encodeURIComponent(token)}/file?path=${encodeURIComponent(path)}`;
}

export function reviewerZipUrl(token: string): string {
  return `/api/review/${encodeURIComponent(token)}/zip`;
}

/** Uploads a package (and optionally a model) to be checked; resolves with the file-by-file result. */
export function useVerifyPackage() {
  return useMutation({
    mutationFn: async ({ pkg, model }: { pkg: File; model?: File | null }) => {
      const form = new FormData();
      form.append('package', pkg);
      if (model) form.append('model', model);
      const post = () => {
        const auth = authorizationHeader();
        return fetch('/api/packages/verify', {
          method: 'POST',
          body: form,
          headers: auth
            ? { Authorization: auth, Accept: 'application/json' }
            : { Accept: 'application/json' },
          credentials: 'include',
        });
      };
      let res = await post();
      if (res.status === 401 && (await refreshSession())) res = await post();
      const body = (await res.json().catch(() => null)) as
        (VerifyResultDto & { message?: string }) | null;
      if (!res.ok)
        throw new ApiError(
          res.status,
          body?.message ?? 'The package could not be checked. Try again.',
        );
      return body as VerifyResultDto;
    },
  });
}
