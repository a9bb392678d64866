import type { ManuscriptDto } from '@foldfolio/shared';
import { LaterRelease } from '../../components/LaterRelease';

export function TemplatesTab(_props: { manuscript: ManuscriptDto }) {
  return (
    <LaterRelease
      icon="git-branch"
      title="Templates"
      description="Versioned figure and table templates shared by the coauthors, with pins and a diff between versions."
    />
  );
}
