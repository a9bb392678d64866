import { useState } from 'react';
import {
  Alert,
  Button,
  HTMLSelect,
  HTMLTable,
  NonIdealState,
  Tag,
  Tooltip,
} from '@blueprintjs/core';
import {
  MEMBERSHIP_ROLES,
  type ManuscriptDto,
  type MemberDto,
  type MembershipRole,
} from '@foldfolio/shared/api';
import { useNavigate } from 'react-router';
import { errorMessage } from '../../api/client';
import { useInvitations, useRevokeInvitation } from '../../api/invitations';
import {
  useChangeMemberRole,
  useLeaveManuscript,
  useMembers,
  useRemoveMember,
} from '../../api/members';
import { InviteDialog } from '../../components/InviteDialog';
import { Loading } from '../../components/Loading';
import { Problem } from '../../components/Problem';
import { notify } from '../../components/toaster';
import { formatDate, formatDateTime, ROLE_LABELS } from '../../hooks/format';
import { useAuth } from '../../hooks/useAuth';

type Pending = { kind: 'remove'; member: MemberDto } | { kind: 'leave'; member: MemberDto };

export function MembersTab({ manuscript }: { manuscript: ManuscriptDto }) {
  const auth = useAuth();
  const me = auth.status === 'signed-in' ? auth.user : null;
  const navigate = useNavigate();
  const isOwner = manuscript.role === 'owner';
  const active = manuscript.status !== 'archived';
  const members = useMembers(manuscript.id);
  const invitations = useInvitations(manuscript.id, isOwner);
  const changeRole = useChangeMemberRole(manuscript.id);
  const remove = useRemoveMember(manuscript.id);
  const leave = useLeaveManuscript(manuscript.id);
  const revoke = useRevokeInvitation(manuscript.id);
  const [inviting, setInviting] = useState(false);
  const [pending, setPending] = useState<Pending | null>(null);

  if (members.isPending) return <Loading label="Loading members…" />;
  if (members.isError) return <Problem error={members.error} />;

  const list = [...members.data].sort(
    (a, b) =>
      MEMBERSHIP_ROLES.indexOf(a.role) - MEMBERSHIP_ROLES.indexOf(b.role) ||
      a.displayName.localeCompare(b.displayName, 'en', { sensitivity: 'base' }),
  );
  const owners = list.filter((m) => m.role === 'owner').length;
  const openInvitations = (invitations.data ?? []).filter((i) => i.state === 'pending' || !i.state);

  const confirmPending = () => {
    if (!pending) return;
    const { kind, member } = pending;
    const onError = (e: unknown) => {
      setPending(null);
      notify(errorMessage(e), 'danger');
    };
    if (kind === 'leave')
      leave.mutate(undefined, {
        onSuccess: () => {
          setPending(null);
          notify(`You left “${manuscript.title}”.`);
          navigate('/desk');
        },
        onError,
      });
    else
      remove.mutate(member.userId, {
        onSuccess: () => {
          setPending(null);
          notify(`${member.displayName} no longer has access.`);
        },
        onError,
      });
  };

  return (
    <div className="ff-members">
      <div className="ff-section-header">
        <h2>Members</h2>
        {isOwner && active && (
          <Button
            intent="primary"
            icon="new-person"
            text="Invite"
            onClick={() => setInviting(true)}
          />
        )}
      </div>

      <HTMLTable className="ff-table" striped data-testid="members-table">
        <thead>
          <tr>
            <th>Name</th>
            <th>E-mail</th>
            <th>Role</th>
            <th className="ff-num">Joined</th>
            <th aria-label="Actions" />
          </tr>
        </thead>
        <tbody>
          {list.map((m) => {
            const isMe = me?.id === m.userId;
            const lastOwner = m.role === 'owner' && owners <= 1;
            return (
              <tr key={m.userId}>
                <td>
                  {m.displayName}
                  {isMe && (
                    <Tag minimal round className="ff-you-tag">
                      you
                    </Tag>
                  )}
                </td>
                <td>{m.email}</td>
                <td>
                  {isOwner && active && !(isMe && lastOwner) ? (
                    <HTMLSelect
                      aria-label={`Role of ${m.displayName}`}
                      value={m.role}
                      disabled={changeRole.isPending}
                      onChange={(e) => {
                        const role = e.currentTarget.value as MembershipRole;
                        changeRole.mutate(
                          { userId: m.userId, role },
                          {
                            onSuccess: () =>
                              notify(`${m.displayName} is now ${ROLE_LABELS[role]}.`),
                            onError: (err) => notify(errorMessage(err), 'danger'),
                          },
                        );
                      }}
                      options={MEMBERSHIP_ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }))}
                    />
                  ) : (
                    (ROLE_LABELS[m.role] ?? m.role)
                  )}
                </td>
                <td className="ff-num">{formatDate(m.joinedAt)}</td>
                <td className="ff-actions">
                  {isMe ? (
                    <Tooltip
                      disabled={!lastOwner}
                      content="A manuscript needs an owner: make someone else owner first."
                    >
                      <Button
                        variant="minimal"
                        icon="log-out"
                        text="Leave"
                        disabled={lastOwner}
                        onClick={() => setPending({ kind: 'leave', member: m })}
                      />
                    </Tooltip>
                  ) : (
                    isOwner &&
                    active && (
                      <Button
                        variant="minimal"
                        icon="remove"
                        text="Remove"
                        disabled={lastOwner}
                        onClick={() => setPending({ kind: 'remove', member: m })}
                      />
                    )
                  )}
                </td>
              </tr>
            );
          })}
        </tbody>
      </HTMLTable>

      {isOwner && (
        <>
          <div className="ff-section-header">
            <h2>Pending invitations</h2>
          </div>
          <Problem error={invitations.error} />
          {invitations.isPending ? (
            <Loading />
          ) : openInvitations.length === 0 ? (
            <NonIdealState
              icon="envelope"
              layout="horizontal"
              iconSize={32}
              description="No invitation is waiting for an answer."
            />
          ) : (
            <HTMLTable className="ff-table" data-testid="invitations-table">
              <thead>
                <tr>
                  <th>E-mail</th>
                  <th>Role</th>
                  <th className="ff-num">Sent</th>
                  <th className="ff-num">Expires</th>
                  <th aria-label="Actions" />
                </tr>
              </thead>
              <tbody>
                {openInvitations.map((inv) => (
                  <tr key={inv.id}>
                    <td>{inv.email}</td>
                    <td>{ROLE_LABELS[inv.role] ?? inv.role}</td>
                    <td className="ff-num">{formatDate(inv.createdAt)}</td>
                    <td className="ff-num">{formatDateTime(inv.expiresAt)}</td>
                    <td className="ff-actions">
                      <Button
                        variant="minimal"
                        icon="cross"
                        text="Revoke"
                        loading={revoke.isPending && revoke.variables === inv.id}
                        onClick={() =>
                          revoke.mutate(inv.id, {
                            onSuccess: () =>
                              notify(`The invitation to ${inv.email} no longer works.`),
                            onError: (e) => notify(errorMessage(e), 'danger'),
                          })
                        }
                      />
                    </td>
                  </tr>
                ))}
              </tbody>
            </HTMLTable>
          )}
        </>
      )}

      <InviteDialog
        manuscriptId={manuscript.id}
        isOpen={inviting}
        onClose={() => setInviting(false)}
      />
      <Alert
        isOpen={pending !== null}
        intent="danger"
        icon={pending?.kind === 'leave' ? 'log-out' : 'remove'}
        confirmButtonText={pending?.kind === 'leave' ? 'Leave manuscript' : 'Remove member'}
        cancelButtonText="Cancel"
        loading={remove.isPending || leave.isPending}
        onCancel={() => setPending(null)}
        onConfirm={confirmPending}
      >
        {pending?.kind === 'leave' ? (
          <p>Leave “{manuscript.title}”? You lose access until an owner invites you again.</p>
        ) : (
          <p>
            Remove {pending?.member.displayName} from “{manuscript.title}”? They lose access at
            once; you can invite them again later.
          </p>
        )}
      </Alert>
    </div>
  );
}
