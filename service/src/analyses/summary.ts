import type { AnalysisSummaryDto, Report } from '@foldfolio/shared';

/** The summary columns stored beside a report: the first model's values. */
export function summaryColumns(report: Report): AnalysisSummaryDto {
  const m = report.models[0];
  const s = m?.summary;
  const rama = s?.rama?.overall ?? null;
  const rot = s?.rotamers ?? null;
  return {
    atoms: s ? s.composition.atoms : null,
    proteinResidues: s ? s.composition.proteinResidues : null,
    ramaFavored: rama ? rama.favored : null,
    ramaAllowed: rama ? rama.allowed : null,
    ramaOutliers: rama ? rama.outlier : null,
    ramaTotal: rama ? rama.total : null,
    rotamerOutliers: rot ? rot.outlier : null,
    rotamerTotal: rot ? rot.total : null,
    bondRmsd: s?.bonds.rmsd ?? null,
    bondRmsz: s?.bonds.rmsZ ?? null,
    angleRmsd: s?.angles.rmsd ?? null,
    angleRmsz: s?.angles.rmsZ ?? null,
    overlapsPer1000: s?.overlaps?.perThousandAtoms ?? null,
    cisPeptides: s ? s.cisPeptides : null,
    twistedPeptides: s ? s.twistedPeptides : null,
    cbOutliers: s ? s.cbOutliers : null,
    dResidues: s ? s.dResidues : null,
  };
}

export const SUMMARY_KEYS: (keyof AnalysisSummaryDto)[] = [
  'atoms',
  'proteinResidues',
  'ramaFavored',
  'ramaAllowed',
  'ramaOutliers',
  'ramaTotal',
  'rotamerOutliers',
  'rotamerTotal',
  'bondRmsd',
  'bondRmsz',
  'angleRmsd',
  'angleRmsz',
  'overlapsPer1000',
  'cisPeptides',
  'twistedPeptides',
  'cbOutliers',
  'dResidues',
];
