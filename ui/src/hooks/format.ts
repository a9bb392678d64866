// Dates shown in a fixed, unambiguous form (ISO day + UTC time) so coauthors in different
// locales read the same thing.
export function formatDateTime(iso: string | undefined | null): string {
  if (!iso) return '—';
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return '—';
  return `${d.toISOString().slice(0, 10)} ${d.toISOString().slice(11, 16)} UTC`;
}

export function formatDate(iso: string | undefined | null): string {
  if (!iso) return '—';
  const d = new Date(iso);
  return Number.isNaN(d.getTime()) ? '—' : d.toISOString().slice(0, 10);
}

export const ROLE_LABELS: Record<string, string> = {
  owner: 'Owner',
  editor: 'Editor',
  commenter: 'Commenter',
  reviewer: 'Reviewer',
  admin: 'Admin',
  user: 'User',
};

export const ROLE_HINTS: Record<string, string> = {
  owner: 'manages members and everything else',
  editor: 'uploads models, edits figures, tables and templates',
  commenter: 'reads everything and joins the discussion',
  reviewer: 'reads the manuscript and its review packages',
};
