// Query keys come from one factory per resource, so an invalidation names exactly what a
// mutation changed and nothing else.
export const meKeys = {
  all: ['me'] as const,
};

export const manuscriptKeys = {
  all: ['manuscripts'] as const,
  list: () => [...manuscriptKeys.all, 'list'] as const,
  detail: (id: string) => [...manuscriptKeys.all, 'detail', id] as const,
};

export const memberKeys = {
  all: ['members'] as const,
  list: (manuscriptId: string) => [...memberKeys.all, manuscriptId] as const,
};

export const invitationKeys = {
  all: ['invitations'] as const,
  list: (manuscriptId: string) => [...invitationKeys.all, 'list', manuscriptId] as const,
  preview: (token: string) => [...invitationKeys.all, 'preview', token] as const,
};

export const adminKeys = {
  all: ['admin'] as const,
  users: () => [...adminKeys.all, 'users'] as const,
  outbox: () => [...adminKeys.all, 'outbox'] as const,
  message: (id: string) => [...adminKeys.all, 'outbox', id] as const,
};
