import { AnchorButton, Button, Callout, NonIdealState } from '@blueprintjs/core';
import { Link, useNavigate, useParams } from 'react-router';
import { useAcceptInvitation, useInvitationPreview } from '../api/invitations';
import { useSignOut } from '../api/auth';
import { AuthLayout } from '../components/AuthLayout';
import { Loading } from '../components/Loading';
import { Problem } from '../components/Problem';
import { formatDateTime, ROLE_HINTS, ROLE_LABELS } from '../hooks/format';
import { useAuth } from '../hooks/useAuth';
import { useDocumentTitle } from '../hooks/useDocumentTitle';

export function AcceptInvitationPage() {
  useDocumentTitle('Invitation');
  const { token = '' } = useParams();
  const auth = useAuth();
  const preview = useInvitationPreview(token);
  const accept = useAcceptInvitation(token);
  const signOut = useSignOut();
  const navigate = useNavigate();
  const here = `/invitations/${encodeURIComponent(token)}`;

  if (preview.isPending || auth.status === 'checking')
    return (
      <AuthLayout title="Invitation">
        <Loading label="Reading the invitation…" />
      </AuthLayout>
    );

  if (preview.isError)
    return (
      <AuthLayout title="Invitation">
        <NonIdealState
          icon="disable"
          title="This invitation cannot be used"
          description={<Problem error={preview.error} />}
          action={<Link to="/desk">Go to your Desk</Link>}
        />
      </AuthLayout>
    );

  const inv = preview.data;
  const otherAccount =
    auth.status === 'signed-in' && auth.user.email.toLowerCase() !== inv.email.toLowerCase();

  return (
    <AuthLayout title="You are invited">
      <div className="ff-invitation">
        <p className="ff-muted">{inv.invitedBy} invites you to join the manuscript</p>
        <h2 className="ff-invitation-title">{inv.manuscriptTitle}</h2>
        <dl className="ff-facts">
          <dt>Role</dt>
          <dd>
            <strong>{ROLE_LABELS[inv.role] ?? inv.role}</strong>
            {ROLE_HINTS[inv.role] ? ` — ${ROLE_HINTS[inv.role]}` : ''}
          </dd>
          <dt>Sent to</dt>
          <dd>{inv.email}</dd>
          <dt>Valid until</dt>
          <dd className="ff-num">{formatDateTime(inv.expiresAt)}</dd>
        </dl>
      </div>

      {auth.status === 'signed-out' ? (
        <>
          <p>Sign in or create an account to accept; you will come straight back here.</p>
          <div className="ff-button-row">
            <AnchorButton
              intent="primary"
              size="large"
              text="Sign in to accept"
              onClick={(e) => {
                e.preventDefault();
                navigate(`/sign-in?next=${encodeURIComponent(here)}`);
              }}
              href={`/sign-in?next=${encodeURIComponent(here)}`}
            />
            <AnchorButton
              size="large"
              text="Create an account"
              onClick={(e) => {
                e.preventDefault();
                navigate(
                  `/register?next=${encodeURIComponent(here)}&email=${encodeURIComponent(inv.email)}`,
                );
              }}
              href={`/register?next=${encodeURIComponent(here)}`}
            />
          </div>
        </>
      ) : (
        <>
          {otherAccount && (
            <Callout intent="warning" icon="person" className="ff-note">
              You are signed in as {auth.user.email}, but the invitation was sent to {inv.email}. If
              that address is yours under another account,{' '}
              <a
                href="#"
                onClick={(e) => {
                  e.preventDefault();
                  signOut.mutate(`/sign-in?next=${encodeURIComponent(here)}`);
                }}
              >
                sign out and sign in with it
              </a>
              .
            </Callout>
          )}
          {!otherAccount && (
            <p className="ff-muted">
              Signed in as {auth.user.displayName} ({auth.user.email}).
            </p>
          )}
          <Problem error={accept.error} />
          <div className="ff-button-row">
            <Button
              intent="primary"
              size="large"
              icon="endorsed"
              text="Accept invitation"
              loading={accept.isPending}
              onClick={() =>
                accept.mutate(undefined, {
                  onSuccess: (r) =>
                    navigate(`/manuscripts/${encodeURIComponent(r.manuscriptId)}/members`),
                })
              }
            />
            <Button
              size="large"
              variant="minimal"
              text="Not now"
              onClick={() => navigate('/desk')}
            />
          </div>
        </>
      )}
    </AuthLayout>
  );
}
