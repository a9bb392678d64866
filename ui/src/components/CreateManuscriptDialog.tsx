import { useState, type FormEvent } from 'react';
import { Button, Dialog, DialogBody, DialogFooter, FormGroup, InputGroup } from '@blueprintjs/core';
import { useNavigate } from 'react-router';
import { useCreateManuscript } from '../api/manuscripts';
import { Problem } from './Problem';
import { notify } from './toaster';

export function CreateManuscriptDialog({
  isOpen,
  onClose,
}: {
  isOpen: boolean;
  onClose: () => void;
}) {
  const create = useCreateManuscript();
  const navigate = useNavigate();
  const [title, setTitle] = useState('');

  const close = () => {
    setTitle('');
    create.reset();
    onClose();
  };
  const submit = (e: FormEvent) => {
    e.preventDefault();
    create.mutate(
      { title: title.trim() },
      {
        onSuccess: (m) => {
          notify(`“${m.title}” is on your Desk.`);
          close();
          navigate(`/manuscripts/${encodeURIComponent(m.id)}/models`);
        },
      },
    );
  };

  return (
    <Dialog isOpen={isOpen} onClose={close} title="New manuscript" icon="manual">
      <form onSubmit={submit}>
        <DialogBody>
          <FormGroup
            label="Working title"
            labelFor="manuscript-title"
            helperText="You can rename it at any time; coauthors see the new title."
          >
            <InputGroup
              id="manuscript-title"
              name="title"
              value={title}
              onValueChange={setTitle}
              placeholder="e.g. Crystal structure of the Thermus lid protease"
              autoFocus
            />
          </FormGroup>
          <Problem error={create.error} />
        </DialogBody>
        <DialogFooter
          actions={
            <>
              <Button text="Cancel" onClick={close} />
              <Button
                type="submit"
                intent="primary"
                text="Create manuscript"
                loading={create.isPending}
                disabled={!title.trim()}
              />
            </>
          }
        />
      </form>
    </Dialog>
  );
}
