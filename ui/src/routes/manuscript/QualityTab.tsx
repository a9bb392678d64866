import type { ManuscriptDto } from '@foldfolio/shared';
import { LaterRelease } from '../../components/LaterRelease';

export function QualityTab(_props: { manuscript: ManuscriptDto }) {
  return (
    <LaterRelease
      icon="pulse"
      title="Quality"
      description="Validation statistics computed from the current model: torsion classes, covalent geometry, overlaps, secondary structure and the change ledger between versions."
    />
  );
}
