import type { ManuscriptDto } from '@foldfolio/shared';
import { LaterRelease } from '../../components/LaterRelease';

export function MethodsTableTab(_props: { manuscript: ManuscriptDto }) {
  return (
    <LaterRelease
      icon="th"
      title="Methods table"
      description="The data-collection and refinement table, filled from the model header and your forms, with the source of every number."
    />
  );
}
