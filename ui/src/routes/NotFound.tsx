import { NonIdealState } from '@blueprintjs/core';
import { Link } from 'react-router';
import { useDocumentTitle } from '../hooks/useDocumentTitle';

export function NotFoundPage() {
  useDocumentTitle('Page not found');
  return (
    <div className="ff-page">
      <NonIdealState
        icon="path-search"
        title="No page at this address"
        description="The link may be mistyped or out of date."
        action={<Link to="/desk">Go to your Desk</Link>}
      />
    </div>
  );
}
