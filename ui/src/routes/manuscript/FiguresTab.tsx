import type { ManuscriptDto } from '@foldfolio/shared';
import { LaterRelease } from '../../components/LaterRelease';

export function FiguresTab(_props: { manuscript: ManuscriptDto }) {
  return (
    <LaterRelease
      icon="media"
      title="Figures"
      description="Publication figures rendered from the manuscript's pinned templates, checked for size, font and palette before you submit."
    />
  );
}
