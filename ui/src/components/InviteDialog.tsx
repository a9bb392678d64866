import { useState, type FormEvent } from 'react';
import {
  Button,
  Dialog,
  DialogBody,
  DialogFooter,
  FormGroup,
  HTMLSelect,
  InputGroup,
} from '@blueprintjs/core';
import { MEMBERSHIP_ROLES, type MembershipRole } from '@foldfolio/shared/api';
import { useInvite } from '../api/invitations';
import { ROLE_HINTS, ROLE_LABELS } from '../hooks/format';
import { Problem } from './Problem';
import { notify } from './toaster';

export function InviteDialog({
  manuscriptId,
  isOpen,
  onClose,
}: {
  manuscriptId: string;
  isOpen: boolean;
  onClose: () => void;
}) {
  const invite = useInvite(manuscriptId);
  const [email, setEmail] = useState('');
  const [role, setRole] = useState<MembershipRole>('commenter');

  const close = () => {
    setEmail('');
    setRole('commenter');
    invite.reset();
    onClose();
  };
  const submit = (e: FormEvent) => {
    e.preventDefault();
    invite.mutate(
      { email: email.trim(), role },
      {
        onSuccess: (inv) => {
          notify(`Invitation sent to ${inv.email}.`);
          close();
        },
      },
    );
  };

  return (
    <Dialog isOpen={isOpen} onClose={close} title="Invite a coauthor" icon="new-person">
      <form onSubmit={submit}>
        <DialogBody>
          <FormGroup
            label="E-mail address"
            labelFor="invite-email"
            helperText="They receive a link that works once and expires after 7 days."
          >
            <InputGroup
              id="invite-email"
              name="email"
              type="email"
              value={email}
              onValueChange={setEmail}
              autoFocus
            />
          </FormGroup>
          <FormGroup label="Role" labelFor="invite-role" helperText={ROLE_HINTS[role]}>
            <HTMLSelect
              id="invite-role"
              name="role"
              value={role}
              onChange={(e) => setRole(e.currentTarget.value as MembershipRole)}
              options={MEMBERSHIP_ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }))}
            />
          </FormGroup>
          <Problem error={invite.error} />
        </DialogBody>
        <DialogFooter
          actions={
            <>
              <Button text="Cancel" onClick={close} />
              <Button
                type="submit"
                intent="primary"
                icon="envelope"
                text="Send invitation"
                loading={invite.isPending}
                disabled={!email.trim()}
              />
            </>
          }
        />
      </form>
    </Dialog>
  );
}
