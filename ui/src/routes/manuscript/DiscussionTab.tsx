import type { ManuscriptDto } from '@foldfolio/shared';
import { LaterRelease } from '../../components/LaterRelease';

export function DiscussionTab(_props: { manuscript: ManuscriptDto }) {
  return (
    <LaterRelease
      icon="chat"
      title="Discussion"
      description="Comment threads anchored to a model version, a residue, a figure or a table cell."
    />
  );
}
