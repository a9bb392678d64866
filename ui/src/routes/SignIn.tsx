import { useState, type FormEvent } from 'react';
import { Button, FormGroup, InputGroup } from '@blueprintjs/core';
import { Link, useNavigate, useSearchParams } from 'react-router';
import { useSignIn } from '../api/auth';
import { AuthLayout } from '../components/AuthLayout';
import { RedirectIfSignedIn } from '../components/Guards';
import { safeNext } from './paths';
import { Problem } from '../components/Problem';
import { useDocumentTitle } from '../hooks/useDocumentTitle';

export function SignInPage() {
  useDocumentTitle('Sign in');
  const [params] = useSearchParams();
  const next = safeNext(params.get('next'));
  const navigate = useNavigate();
  const signIn = useSignIn();
  const [email, setEmail] = useState('');
  const [password, setPassword] = useState('');

  const submit = (e: FormEvent) => {
    e.preventDefault();
    signIn.mutate({ email: email.trim(), password }, { onSuccess: () => navigate(next) });
  };
  const withNext = (path: string) =>
    params.get('next') ? `${path}?next=${encodeURIComponent(next)}` : path;

  return (
    <RedirectIfSignedIn next={next}>
      <AuthLayout title="Sign in">
        <form onSubmit={submit} noValidate>
          <FormGroup label="E-mail address" labelFor="signin-email">
            <InputGroup
              id="signin-email"
              name="email"
              type="email"
              autoComplete="username"
              value={email}
              onValueChange={setEmail}
              autoFocus
              required
            />
          </FormGroup>
          <FormGroup label="Password" labelFor="signin-password">
            <InputGroup
              id="signin-password"
              name="password"
              type="password"
              autoComplete="current-password"
              value={password}
              onValueChange={setPassword}
              required
            />
          </FormGroup>
          <Problem error={signIn.error} />
          <Button
            type="submit"
            intent="primary"
            fill
            size="large"
            loading={signIn.isPending}
            disabled={!email || !password}
            text="Sign in"
          />
        </form>
        <div className="ff-auth-links">
          <Link to={withNext('/register')}>Create an account</Link>
          <Link to="/reset-password">Forgot your password?</Link>
        </div>
      </AuthLayout>
    </RedirectIfSignedIn>
  );
}
