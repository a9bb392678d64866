import { useState } from 'react';
import { Alert, Button, HTMLSelect, HTMLTable, Tag } from '@blueprintjs/core';
import type { AdminUserDto, SiteRole } from '@foldfolio/shared';
import { errorMessage } from '../../api/client';
import { useAdminUsers, useChangeSiteRole, useDeleteUser } from '../../api/admin';
import { Loading } from '../../components/Loading';
import { Problem } from '../../components/Problem';
import { notify } from '../../components/toaster';
import { formatDate, ROLE_LABELS } from '../../hooks/format';
import { useAuth } from '../../hooks/useAuth';

const SITE_ROLES: SiteRole[] = ['admin', 'user'];

export function UsersPage() {
  const auth = useAuth();
  const users = useAdminUsers();
  const change = useChangeSiteRole();
  const remove = useDeleteUser();
  const [deleting, setDeleting] = useState<AdminUserDto | null>(null);
  if (users.isPending) return <Loading label="Loading accounts…" />;
  if (users.isError) return <Problem error={users.error} />;
  const rows = [...users.data].sort((a, b) => a.email.localeCompare(b.email));

  return (
    <>
      <HTMLTable className="ff-table" striped data-testid="users-table">
        <thead>
          <tr>
            <th>Name</th>
            <th>E-mail</th>
            <th>Site role</th>
            <th className="ff-num">Manuscripts</th>
            <th className="ff-num">Registered</th>
            <th aria-label="Actions" />
          </tr>
        </thead>
        <tbody>
          {rows.map((u) => {
            const isMe = auth.user?.id === u.id;
            return (
              <tr key={u.id}>
                <td>
                  {u.displayName}
                  {isMe && (
                    <Tag minimal round className="ff-you-tag">
                      you
                    </Tag>
                  )}
                </td>
                <td>{u.email}</td>
                <td>
                  <HTMLSelect
                    aria-label={`Site role of ${u.displayName}`}
                    value={u.siteRole}
                    disabled={change.isPending}
                    onChange={(e) => {
                      const siteRole = e.currentTarget.value as SiteRole;
                      change.mutate(
                        { id: u.id, siteRole },
                        {
                          onSuccess: () =>
                            notify(
                              `${u.displayName} now has the site role ${ROLE_LABELS[siteRole]}.`,
                            ),
                          onError: (err) => notify(errorMessage(err), 'danger'),
                        },
                      );
                    }}
                    options={SITE_ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }))}
                  />
                </td>
                <td className="ff-num">{u.manuscriptCount ?? '—'}</td>
                <td className="ff-num">{formatDate(u.createdAt)}</td>
                <td className="ff-actions">
                  {!isMe && (
                    <Button
                      variant="minimal"
                      icon="trash"
                      text="Delete"
                      aria-label={`Delete the account of ${u.displayName}`}
                      onClick={() => setDeleting(u)}
                    />
                  )}
                </td>
              </tr>
            );
          })}
        </tbody>
      </HTMLTable>
      <Alert
        isOpen={deleting !== null}
        intent="danger"
        icon="trash"
        confirmButtonText="Delete account"
        cancelButtonText="Cancel"
        loading={remove.isPending}
        onCancel={() => setDeleting(null)}
        onConfirm={() => {
          if (!deleting) return;
          const who = deleting;
          remove.mutate(who.id, {
            onSuccess: () => notify(`The account of ${who.displayName} has been deleted.`),
            onError: (e) => notify(errorMessage(e), 'danger'),
            onSettled: () => setDeleting(null),
          });
        }}
      >
        <p>
          Delete the account of {deleting?.displayName} ({deleting?.email})? They can no longer sign
          in and lose every membership. Manuscripts they alone own must get another owner first.
        </p>
      </Alert>
    </>
  );
}
