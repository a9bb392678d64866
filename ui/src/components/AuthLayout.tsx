import type { ReactNode } from 'react';
import { Card } from '@blueprintjs/core';
import { Link } from 'react-router';
import { Wordmark } from './Wordmark';

/** The quiet single-card page used before a user is signed in. */
export function AuthLayout({ title, children }: { title: string; children: ReactNode }) {
  return (
    <div className="ff-auth-page">
      <Link to="/" className="ff-auth-brand" aria-label="Foldfolio home">
        <Wordmark size={36} />
      </Link>
      <p className="ff-tagline">Validation, figures and review packages for structure papers.</p>
      <Card className="ff-auth-card" elevation={1}>
        <h1 className="ff-auth-title">{title}</h1>
        {children}
      </Card>
    </div>
  );
}
