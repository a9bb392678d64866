import type { ManuscriptDto } from '@foldfolio/shared';
import { LaterRelease } from '../../components/LaterRelease';

export function ReviewPackagesTab(_props: { manuscript: ManuscriptDto }) {
  return (
    <LaterRelease
      icon="box"
      title="Review packages"
      description="Frozen, self-describing packages for reviewers and editors, with checksums and a verify command."
    />
  );
}
