import { useState, type FormEvent } from 'react';
import { Button, Callout, FormGroup, InputGroup } from '@blueprintjs/core';
import { Link, useParams } from 'react-router';
import { useConfirmPasswordReset, useRequestPasswordReset } from '../api/auth';
import { AuthLayout } from '../components/AuthLayout';
import { Problem } from '../components/Problem';
import { useDocumentTitle } from '../hooks/useDocumentTitle';
import { MIN_PASSWORD_LENGTH } from './Register';

export function ResetRequestPage() {
  useDocumentTitle('Reset your password');
  const request = useRequestPasswordReset();
  const [email, setEmail] = useState('');

  const submit = (e: FormEvent) => {
    e.preventDefault();
    request.mutate({ email: email.trim() });
  };

  return (
    <AuthLayout title="Reset your password">
      {request.isSuccess ? (
        <Callout intent="success" icon="envelope" className="ff-note">
          If an account uses <strong>{email.trim()}</strong>, a message with a link to set a new
          password is on its way. The link works once and expires; open it from that message.
        </Callout>
      ) : (
        <form onSubmit={submit} noValidate>
          <p className="ff-muted">
            Enter the address you registered with and we will send you a link to set a new password.
          </p>
          <FormGroup label="E-mail address" labelFor="reset-email">
            <InputGroup
              id="reset-email"
              name="email"
              type="email"
              autoComplete="email"
              value={email}
              onValueChange={setEmail}
              autoFocus
            />
          </FormGroup>
          <Problem error={request.error} />
          <Button
            type="submit"
            intent="primary"
            fill
            size="large"
            loading={request.isPending}
            disabled={!email.trim()}
            text="Send reset link"
          />
        </form>
      )}
      <div className="ff-auth-links">
        <Link to="/sign-in">Back to sign-in</Link>
      </div>
    </AuthLayout>
  );
}

export function ResetConfirmPage() {
  useDocumentTitle('Set a new password');
  const { token = '' } = useParams();
  const confirm = useConfirmPasswordReset();
  const [password, setPassword] = useState('');
  const [repeat, setRepeat] = useState('');
  const mismatch = repeat.length > 0 && repeat !== password;

  const submit = (e: FormEvent) => {
    e.preventDefault();
    confirm.mutate({ token, password });
  };

  return (
    <AuthLayout title="Set a new password">
      {confirm.isSuccess ? (
        <Callout intent="success" icon="tick" className="ff-note">
          Your password has been changed. <Link to="/sign-in">Sign in</Link> with the new one.
        </Callout>
      ) : (
        <form onSubmit={submit} noValidate>
          <FormGroup
            label="New password"
            labelFor="reset-password"
            helperText={`At least ${MIN_PASSWORD_LENGTH} characters.`}
          >
            <InputGroup
              id="reset-password"
              type="password"
              autoComplete="new-password"
              value={password}
              onValueChange={setPassword}
              autoFocus
            />
          </FormGroup>
          <FormGroup
            label="Repeat it"
            labelFor="reset-repeat"
            intent={mismatch ? 'danger' : 'none'}
            helperText={mismatch ? 'The two passwords differ; type the same one twice.' : undefined}
          >
            <InputGroup
              id="reset-repeat"
              type="password"
              autoComplete="new-password"
              value={repeat}
              onValueChange={setRepeat}
              intent={mismatch ? 'danger' : 'none'}
            />
          </FormGroup>
          <Problem error={confirm.error} />
          <Button
            type="submit"
            intent="primary"
            fill
            size="large"
            loading={confirm.isPending}
            disabled={password.length < MIN_PASSWORD_LENGTH || password !== repeat}
            text="Set new password"
          />
        </form>
      )}
      <div className="ff-auth-links">
        <Link to="/reset-password">Ask for a new link</Link>
        <Link to="/sign-in">Back to sign-in</Link>
      </div>
    </AuthLayout>
  );
}
