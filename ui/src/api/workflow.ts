// Hooks for the manuscript workflow: model versions and uploads, analyses and reports, the
// version ledger, anchored comments and the caller's notification setting.
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type {
  AnalysisDto,
  CommentAnchor,
  CommentThreadDto,
  CreateCommentBody,
  LedgerDto,
  ModelVersionDto,
  NotificationSettingsDto,
  Report,
} from '@foldfolio/shared';
import { ApiError, api, authorizationHeader, refreshSession } from './client';

const base = (manuscriptId: string) => `/api/manuscripts/${encodeURIComponent(manuscriptId)}`;

export const workflowKeys = {
  versions: (m: string) => ['versions', m] as const,
  report: (m: string, v: string) => ['versions', m, v, 'report'] as const,
  ledger: (m: string, v: string, against?: string) =>
    ['versions', m, v, 'ledger', against ?? 'previous'] as const,
  comments: (m: string) => ['comments', m] as const,
  commentList: (m: string, filter: Record<string, string | undefined>) =>
    ['comments', m, 'list', filter] as const,
  commentCounts: (m: string, v: string) => ['comments', m, 'counts', v] as const,
  notifications: (m: string) => ['notifications', m] as const,
};

const unfinished = (a: AnalysisDto | null) =>
  a !== null && (a.status === 'queued' || a.status === 'running');

/** Versions, newest first; polls every second while any analysis is queued or running. */
export function useModelVersions(manuscriptId: string) {
  return useQuery({
    queryKey: workflowKeys.versions(manuscriptId),
    queryFn: () => api<ModelVersionDto[]>(`${base(manuscriptId)}/models`),
    refetchInterval: (q) => (q.state.data?.some((v) => unfinished(v.analysis)) ? 1000 : false),
  });
}

export function useReport(manuscriptId: string, versionId: string | null) {
  return useQuery({
    queryKey: workflowKeys.report(manuscriptId, versionId ?? ''),
    queryFn: () =>
      api<Report>(`${base(manuscriptId)}/models/${encodeURIComponent(versionId ?? '')}/report`),
    enabled: versionId !== null,
    // a finished report never changes (versions are immutable)
    staleTime: Infinity,
  });
}

export function useLedger(manuscriptId: string, versionId: string | null, against?: string) {
  return useQuery({
    queryKey: workflowKeys.ledger(manuscriptId, versionId ?? '', against),
    queryFn: () =>
      api<{ ledger: LedgerDto | null }>(
        `${base(manuscriptId)}/models/${encodeURIComponent(versionId ?? '')}/ledger${against ? `?against=${encodeURIComponent(against)}` : ''}`,
      ),
    enabled: versionId !== null,
    staleTime: Infinity,
  });
}

export interface UploadInput {
  file: File;
  note: string;
  onProgress?: (fraction: number) => void;
}

function xhrUpload(
  url: string,
  form: FormData,
  onProgress?: (f: number) => void,
): Promise<{ status: number; body: unknown }> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', url);
    const auth = authorizationHeader();
    if (auth) xhr.setRequestHeader('Authorization', auth);
    xhr.setRequestHeader('Accept', 'application/json');
    xhr.withCredentials = true;
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress?.(e.loaded / e.total);
    };
    xhr.onload = () => {
      let body: unknown = null;
      try {
        body = xhr.responseText ? JSON.parse(xhr.responseText) : null;
      } catch {
        body = null;
      }
      resolve({ status: xhr.status, body });
    };
    xhr.onerror = () =>
      reject(
        new ApiError(
          0,
          'The upload could not reach the server. Check your connection and try again.',
        ),
      );
    xhr.send(form);
  });
}

/** Streams the file to the service (multipart), reporting upload progress. */
export function useUploadModel(manuscriptId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: async ({ file, note, onProgress }: UploadInput) => {
      const form = new FormData();
      // the note goes first so the service has it before the (possibly large) file
      form.append('note', note);
      form.append('file', file, file.name);
      const url = `${base(manuscriptId)}/models`;
      let res = await xhrUpload(url, form, onProgress);
      if (res.status === 401 && (await refreshSession()))
        res = await xhrUpload(url, form, onProgress);
      if (res.status < 200 || res.status >= 300) {
        const b = res.body as { message?: string } | null;
        throw new ApiError(
          res.status,
          b?.message ?? `The upload failed (${res.status}). Try again.`,
        );
      }
      return res.body as ModelVersionDto;
    },
    onSuccess: () => qc.invalidateQueries({ queryKey: workflowKeys.versions(manuscriptId) }),
  });
}

export function useComments(
  manuscriptId: string,
  filter: { modelVersionId?: string; anchorKey?: string; status?: string },
  enabled = true,
) {
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(filter)) if (v) params.set(k, v);
  return useQuery({
    queryKey: workflowKeys.commentList(manuscriptId, filter),
    queryFn: () => api<CommentThreadDto[]>(`${base(manuscriptId)}/comments?${params.toString()}`),
    enabled,
  });
}

export function useCommentCounts(manuscriptId: string, versionId: string | null, enabled = true) {
  return useQuery({
    queryKey: workflowKeys.commentCounts(manuscriptId, versionId ?? ''),
    queryFn: () =>
      api<Record<string, number>>(
        `${base(manuscriptId)}/comments/counts/${encodeURIComponent(versionId ?? '')}`,
      ),
    enabled: enabled && versionId !== null,
  });
}

function useCommentMutation<V>(manuscriptId: string, fn: (v: V) => Promise<CommentThreadDto>) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: fn,
    onSuccess: () => qc.invalidateQueries({ queryKey: workflowKeys.comments(manuscriptId) }),
  });
}

export function useCreateComment(manuscriptId: string) {
  return useCommentMutation(manuscriptId, (body: { anchor: CommentAnchor; body: string }) =>
    api<CommentThreadDto>(`${base(manuscriptId)}/comments`, {
      method: 'POST',
      body: body satisfies CreateCommentBody,
    }),
  );
}

export function useReply(manuscriptId: string) {
  return useCommentMutation(manuscriptId, ({ id, body }: { id: string; body: string }) =>
    api<CommentThreadDto>(`${base(manuscriptId)}/comments/${encodeURIComponent(id)}/replies`, {
      method: 'POST',
      body: { body },
    }),
  );
}

export function useSetResolved(manuscriptId: string) {
  return useCommentMutation(manuscriptId, ({ id, resolved }: { id: string; resolved: boolean }) =>
    api<CommentThreadDto>(
      `${base(manuscriptId)}/comments/${encodeURIComponent(id)}/${resolved ? 'resolve' : 'reopen'}`,
      {
        method: 'POST',
      },
    ),
  );
}

export function useNotificationSetting(manuscriptId: string) {
  return useQuery({
    queryKey: workflowKeys.notifications(manuscriptId),
    queryFn: () => api<NotificationSettingsDto>(`${base(manuscriptId)}/notifications`),
  });
}

export function useSetMuted(manuscriptId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (muted: boolean) =>
      api<NotificationSettingsDto>(`${base(manuscriptId)}/notifications`, {
        method: 'PUT',
        body: { muted },
      }),
    onSuccess: (data) => qc.setQueryData(workflowKeys.notifications(manuscriptId), data),
  });
}

/** The key the service gives a residue anchor (see the comments service). */
export function residueAnchorKey(
  versionId: string,
  chain: string,
  seq: number,
  icode: string,
): string {
  return `residue:${versionId}:${chain}:${seq}:${icode}`;
}
