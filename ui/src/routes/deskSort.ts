import type { ManuscriptDto, MembershipRole } from '@foldfolio/shared';

export type SortKey = 'title' | 'role' | 'memberCount' | 'lastActivityAt';
export type Sort = { key: SortKey; dir: 1 | -1 };

// owners first: the manuscripts a person is responsible for come before those they only read
const ROLE_ORDER: Record<MembershipRole, number> = {
  owner: 0,
  editor: 1,
  commenter: 2,
  reviewer: 3,
};

const compare: Record<SortKey, (a: ManuscriptDto, b: ManuscriptDto) => number> = {
  title: (a, b) => a.title.localeCompare(b.title, 'en', { sensitivity: 'base', numeric: true }),
  role: (a, b) => ROLE_ORDER[a.role] - ROLE_ORDER[b.role],
  memberCount: (a, b) => a.memberCount - b.memberCount,
  // ISO 8601 UTC strings sort as text in time order
  lastActivityAt: (a, b) => a.lastActivityAt.localeCompare(b.lastActivityAt),
};

export function sortManuscripts(rows: readonly ManuscriptDto[], sort: Sort): ManuscriptDto[] {
  // ties fall back to the id so the order never depends on the server's
  return [...rows].sort((a, b) => sort.dir * compare[sort.key](a, b) || a.id.localeCompare(b.id));
}

/** Clicking a header: the same column flips direction; a new column starts in its natural one. */
export function nextSort(current: Sort, key: SortKey): Sort {
  if (current.key === key) return { key, dir: current.dir === 1 ? -1 : 1 };
  // newest activity and most members first; text columns A→Z
  return { key, dir: key === 'lastActivityAt' || key === 'memberCount' ? -1 : 1 };
}
