import { Callout } from '@blueprintjs/core';
import { errorMessage } from '../api/client';

/** A problem the user can act on: the server's sentence, in the one colour reserved for problems. */
export function Problem({ error, title }: { error: unknown; title?: string }) {
  if (!error) return null;
  return (
    <Callout intent="danger" icon="warning-sign" title={title} className="ff-problem" role="alert">
      {errorMessage(error)}
    </Callout>
  );
}
