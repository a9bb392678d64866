// Hooks for figures, the methods table and versioned templates of one manuscript.
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { ApiError, api, authorizationHeader, refreshSession } from './client';

const base = (m: string) => `/api/manuscripts/${encodeURIComponent(m)}`;

export const figureKeys = {
  catalog: (m: string) => ['figures', m, 'catalog'] as const,
  figure: (m: string, v: string, key: string, preset: string, params: string) =>
    ['figures', m, v, key, preset, params] as const,
  table: (m: string, v: string, slot: string) => ['methods-table', m, v, slot] as const,
  form: (m: string, v: string) => ['methods-form', m, v] as const,
};
export const templateKeys = {
  all: (m: string) => ['templates', m] as const,
  list: (m: string) => ['templates', m, 'list'] as const,
  version: (m: string, ref: string) => ['templates', m, 'version', ref] as const,
  diff: (m: string, from: string, to: string) => ['templates', m, 'diff', from, to] as const,
  pins: (m: string) => ['templates', m, 'pins'] as const,
};

export interface TemplateParameter {
  name: string;
  type: 'number' | 'string' | 'boolean';
  default: number | string | boolean;
  description: string;
  min?: number;
  max?: number;
}
export interface FigureCatalog {
  presets: { id: string; name: string; widthMm: number }[];
  figures: {
    key: string;
    title: string;
    description: string;
    parameters: TemplateParameter[];
    needsComparison: boolean;
    template: { templateId: string; n: number; name: string; isDefault: boolean };
  }[];
}
export interface ReadinessIssue {
  check: string;
  message: string;
  element?: string;
  [k: string]: unknown;
}
export interface FigureDto {
  key: string;
  presetId: string;
  template: { templateId: string; n: number };
  renderKey: string;
  svg: string;
  readiness: { ok: boolean; issues: ReadinessIssue[]; [k: string]: unknown };
}
export interface TableValueDto {
  key: string;
  label: string;
  value: string | number | null;
  origin: 'file' | 'form' | 'computed';
  source: string;
}
export interface MethodsTableDto {
  key: string;
  template: { templateId: string; n: number };
  method: string;
  html: string;
  values: TableValueDto[];
  used: string[];
  form: Record<string, string | number | null>;
  fields: { key: string; label: string; kind: 'number' | 'string' }[];
}
export interface TemplateVersionDto {
  templateId: string;
  n: number;
  sha256: string;
  author: string;
  message: string;
  createdAt: string;
}
export interface TemplateDto {
  id: string;
  kind: 'figure' | 'table';
  key: string;
  name: string;
  scope: 'builtin' | 'lab' | 'manuscript';
  forkedFrom: string | null;
  latest: number;
  versions: TemplateVersionDto[];
}
export interface PinDto {
  key: string;
  kind: 'figure' | 'table';
  title: string;
  templateId: string;
  templateName: string;
  n: number;
  isDefault: boolean;
}
export interface DiffDto {
  from: string;
  to: string;
  patch: string;
  parts: { added: boolean; removed: boolean; value: string }[];
}

export function useFigureCatalog(m: string) {
  return useQuery({
    queryKey: figureKeys.catalog(m),
    queryFn: () => api<FigureCatalog>(`${base(m)}/figures`),
  });
}

export function figureQuery(preset: string, params: Record<string, unknown>): string {
  const q = new URLSearchParams({ preset });
  if (Object.keys(params).length) q.set('params', JSON.stringify(params));
  return q.toString();
}

export function useFigure(
  m: string,
  versionId: string | null,
  key: string,
  preset: string,
  params: Record<string, unknown>,
  enabled = true,
) {
  const p = JSON.stringify(params);
  return useQuery({
    queryKey: figureKeys.figure(m, versionId ?? '', key, preset, p),
    queryFn: () =>
      api<FigureDto>(
        `${base(m)}/models/${encodeURIComponent(versionId ?? '')}/figures/${encodeURIComponent(key)}?${figureQuery(preset, params)}`,
      ),
    enabled: enabled && versionId !== null,
    staleTime: 60_000,
    retry: false,
  });
}

export function useMethodsTable(m: string, versionId: string | null, slot: string) {
  return useQuery({
    queryKey: figureKeys.table(m, versionId ?? '', slot),
    queryFn: () =>
      api<MethodsTableDto>(
        `${base(m)}/models/${encodeURIComponent(versionId ?? '')}/methods-table${slot ? `?template=${encodeURIComponent(slot)}` : ''}`,
      ),
    enabled: versionId !== null,
    retry: false,
  });
}

export function useSaveMethodsForm(m: string, versionId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (values: Record<string, string | number | null>) =>
      api<Record<string, string | number | null>>(
        `${base(m)}/models/${encodeURIComponent(versionId)}/methods-form`,
        { method: 'PUT', body: { values } },
      ),
    onSuccess: () => {
      void qc.invalidateQueries({ queryKey: ['methods-table', m, versionId] });
      void qc.invalidateQueries({ queryKey: figureKeys.form(m, versionId) });
    },
  });
}

export function useTemplates(m: string) {
  return useQuery({
    queryKey: templateKeys.list(m),
    queryFn: () => api<TemplateDto[]>(`${base(m)}/templates`),
  });
}

export function useTemplateVersion(m: string, ref: string | null) {
  return useQuery({
    queryKey: templateKeys.version(m, ref ?? ''),
    queryFn: () => {
      const at = ref!.lastIndexOf('@');
      return api<TemplateVersionDto & { body: string; kind: string; key: string }>(
        `${base(m)}/templates/${encodeURIComponent(ref!.slice(0, at))}/versions/${ref!.slice(at + 1)}`,
      );
    },
    enabled: ref !== null,
    // versions are immutable
    staleTime: Infinity,
  });
}

export function useTemplateDiff(m: string, from: string | null, to: string | null) {
  return useQuery({
    queryKey: templateKeys.diff(m, from ?? '', to ?? ''),
    queryFn: () =>
      api<DiffDto>(
        `${base(m)}/templates/diff?${new URLSearchParams({ from: from!, to: to! }).toString()}`,
      ),
    enabled: from !== null && to !== null,
    staleTime: Infinity,
  });
}

export function usePins(m: string) {
  return useQuery({
    queryKey: templateKeys.pins(m),
    queryFn: () => api<PinDto[]>(`${base(m)}/template-pins`),
  });
}

/** Pins change what figures and tables render: refresh those too. */
function invalidateRendered(qc: ReturnType<typeof useQueryClient>, m: string) {
  void qc.invalidateQueries({ queryKey: templateKeys.all(m) });
  void qc.invalidateQueries({ queryKey: ['figures', m] });
  void qc.invalidateQueries({ queryKey: ['methods-table', m] });
}

export function useForkTemplate(m: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: { from: string; scope: 'manuscript' | 'lab'; name: string }) =>
      api<TemplateDto>(`${base(m)}/templates`, { method: 'POST', body: input }),
    onSuccess: () => void qc.invalidateQueries({ queryKey: templateKeys.list(m) }),
  });
}

export function useSaveTemplateVersion(m: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: { templateId: string; body: string; message: string }) =>
      api<TemplateVersionDto>(
        `${base(m)}/templates/${encodeURIComponent(input.templateId)}/versions`,
        { method: 'POST', body: { body: input.body, message: input.message } },
      ),
    onSuccess: () => void qc.invalidateQueries({ queryKey: templateKeys.list(m) }),
  });
}

export function usePinTemplate(m: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: { key: string; version: string }) =>
      api<PinDto>(`${base(m)}/template-pins/${encodeURIComponent(input.key)}`, {
        method: 'PUT',
        body: { version: input.version },
      }),
    onSuccess: () => invalidateRendered(qc, m),
  });
}

export type PreviewDto =
  | { kind: 'figure'; svg: string; readiness: FigureDto['readiness'] }
  | { kind: 'table'; html: string };

export function previewTemplate(
  m: string,
  input: { key: string; body: string; modelVersionId: string; templateId?: string },
): Promise<PreviewDto> {
  return api<PreviewDto>(`${base(m)}/templates/preview`, { method: 'POST', body: input });
}

/** The line a template error names ("line 12" / "Line 12:"), if any. */
export function errorLine(err: unknown): number | null {
  if (!(err instanceof Error)) return null;
  const m = /\bline (\d+)/i.exec(err.message);
  return m ? Number(m[1]) : null;
}

/** Downloads an export with the access token (a plain link could not carry it). */
export async function downloadExport(path: string, filename: string): Promise<void> {
  const get = () => {
    const auth = authorizationHeader();
    return fetch(path, { headers: auth ? { Authorization: auth } : {}, credentials: 'include' });
  };
  let res = await get();
  if (res.status === 401 && (await refreshSession())) res = await get();
  if (!res.ok) {
    let message = `The export failed (${res.status}). Try again in a moment.`;
    try {
      const body = (await res.json()) as { message?: string };
      if (body.message) message = body.message;
    } catch {
      // keep the generic sentence
    }
    throw new ApiError(res.status, message);
  }
  const url = URL.createObjectURL(await res.blob());
  const a = document.createElement('a');
  a.href = url;
  a.download = filename;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

export const manuscriptApiBase = base;
