// Desk ordering. Expected orders are written out by hand from the rule the column promises.
import type { ManuscriptDto } from '@foldfolio/shared';
import { nextSort, sortManuscripts } from '../src/routes/deskSort';

const m = (
  id: string,
  title: string,
  role: ManuscriptDto['role'],
  memberCount: number,
  lastActivityAt: string,
): ManuscriptDto => ({
  id,
  title,
  role,
  memberCount,
  lastActivityAt,
  status: 'active',
  createdAt: '2026-01-01T00:00:00.000Z',
});

const rows = [
  m('a', 'apo form, 2.1 Å', 'reviewer', 3, '2026-03-01T10:00:00.000Z'),
  m('b', 'Holo form 10', 'owner', 1, '2026-03-02T09:00:00.000Z'),
  m('c', 'Holo form 9', 'editor', 5, '2026-02-28T23:59:59.000Z'),
  m('d', 'Zinc site', 'owner', 3, '2026-03-01T10:00:00.000Z'),
];
const ids = (xs: ManuscriptDto[]) => xs.map((x) => x.id).join('');

test('titles sort case-insensitively with numbers in numeric order (9 before 10)', () => {
  expect(ids(sortManuscripts(rows, { key: 'title', dir: 1 }))).toBe('acbd');
  expect(ids(sortManuscripts(rows, { key: 'title', dir: -1 }))).toBe('dbca');
});

test('roles sort owner → editor → commenter → reviewer; ties by id', () => {
  expect(ids(sortManuscripts(rows, { key: 'role', dir: 1 }))).toBe('bdca');
});

test('last activity newest first; equal times fall back to id', () => {
  expect(ids(sortManuscripts(rows, { key: 'lastActivityAt', dir: -1 }))).toBe('badc');
});

test('member counts ascending', () => {
  expect(ids(sortManuscripts(rows, { key: 'memberCount', dir: 1 }))).toBe('badc');
});

test('clicking the same column flips it; a new column starts in its natural direction', () => {
  expect(nextSort({ key: 'title', dir: 1 }, 'title')).toEqual({ key: 'title', dir: -1 });
  expect(nextSort({ key: 'title', dir: 1 }, 'lastActivityAt')).toEqual({
    key: 'lastActivityAt',
    dir: -1,
  });
  expect(nextSort({ key: 'lastActivityAt', dir: -1 }, 'role')).toEqual({ key: 'role', dir: 1 });
});
