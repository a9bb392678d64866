import type { ManuscriptDto } from '@foldfolio/shared';
import { LaterRelease } from '../../components/LaterRelease';

export function ModelsTab(_props: { manuscript: ManuscriptDto }) {
  return (
    <LaterRelease
      icon="cube"
      title="Models"
      description="Upload each refined model (PDBx/mmCIF, BinaryCIF or PDB) as a new version and see what changed since the last one."
    />
  );
}
