import { useState, type FormEvent } from 'react';
import { Button, FormGroup, InputGroup } from '@blueprintjs/core';
import { Link, useNavigate, useSearchParams } from 'react-router';
import { useRegister } from '../api/auth';
import { AuthLayout } from '../components/AuthLayout';
import { RedirectIfSignedIn } from '../components/Guards';
import { safeNext } from './paths';
import { Problem } from '../components/Problem';
import { useDocumentTitle } from '../hooks/useDocumentTitle';

// the service's rule for passwords (register and reset); checked here only to explain it early
export const MIN_PASSWORD_LENGTH = 10;

export function RegisterPage() {
  useDocumentTitle('Create an account');
  const [params] = useSearchParams();
  const next = safeNext(params.get('next'));
  const navigate = useNavigate();
  const register = useRegister();
  const [displayName, setDisplayName] = useState('');
  const [email, setEmail] = useState(params.get('email') ?? '');
  const [password, setPassword] = useState('');
  const tooShort = password.length > 0 && password.length < MIN_PASSWORD_LENGTH;

  const submit = (e: FormEvent) => {
    e.preventDefault();
    register.mutate(
      { displayName: displayName.trim(), email: email.trim(), password },
      { onSuccess: () => navigate(next) },
    );
  };

  return (
    <RedirectIfSignedIn next={next}>
      <AuthLayout title="Create an account">
        <form onSubmit={submit} noValidate>
          <FormGroup
            label="Your name"
            labelFor="register-name"
            helperText="As coauthors should see it."
          >
            <InputGroup
              id="register-name"
              name="displayName"
              autoComplete="name"
              value={displayName}
              onValueChange={setDisplayName}
              autoFocus
            />
          </FormGroup>
          <FormGroup label="E-mail address" labelFor="register-email">
            <InputGroup
              id="register-email"
              name="email"
              type="email"
              autoComplete="email"
              value={email}
              onValueChange={setEmail}
            />
          </FormGroup>
          <FormGroup
            label="Password"
            labelFor="register-password"
            intent={tooShort ? 'danger' : 'none'}
            helperText={`At least ${MIN_PASSWORD_LENGTH} characters.`}
          >
            <InputGroup
              id="register-password"
              name="password"
              type="password"
              autoComplete="new-password"
              value={password}
              onValueChange={setPassword}
              intent={tooShort ? 'danger' : 'none'}
            />
          </FormGroup>
          <Problem error={register.error} />
          <Button
            type="submit"
            intent="primary"
            fill
            size="large"
            loading={register.isPending}
            disabled={!displayName.trim() || !email.trim() || password.length < MIN_PASSWORD_LENGTH}
            text="Create account"
          />
        </form>
        <div className="ff-auth-links">
          <span>
            Already registered?{' '}
            <Link
              to={params.get('next') ? `/sign-in?next=${encodeURIComponent(next)}` : '/sign-in'}
            >
              Sign in
            </Link>
          </span>
        </div>
      </AuthLayout>
    </RedirectIfSignedIn>
  );
}
