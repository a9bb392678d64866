import type { AnalysisSummaryDto } from '@foldfolio/shared';

export const SUMMARY_LABELS: Record<keyof AnalysisSummaryDto, string> = {
  atoms: 'Atoms',
  proteinResidues: 'Protein residues',
  ramaFavored: 'Ramachandran favored',
  ramaAllowed: 'Ramachandran allowed',
  ramaOutliers: 'Ramachandran outliers',
  ramaTotal: 'Residues with a torsion verdict',
  rotamerOutliers: 'Rotamer outliers',
  rotamerTotal: 'Side chains judged',
  bondRmsd: 'Bond length RMSD (Å)',
  bondRmsz: 'Bond length RMS-Z',
  angleRmsd: 'Bond angle RMSD (°)',
  angleRmsz: 'Bond angle RMS-Z',
  overlapsPer1000: 'Severe overlaps per 1000 atoms',
  cisPeptides: 'Cis peptides',
  twistedPeptides: 'Twisted peptides',
  cbOutliers: 'Cβ deviations',
  dResidues: 'Chirality (D) outliers',
};

export function formatValue(key: string, v: number | null): string {
  if (v === null || v === undefined) return '—';
  if (Number.isInteger(v)) return String(v);
  return key.endsWith('Rmsz') || key === 'overlapsPer1000' ? v.toFixed(2) : v.toFixed(3);
}

export function pct(part: number | null, total: number | null): string {
  if (part === null || !total) return '—';
  return `${((100 * part) / total).toFixed(1)} %`;
}
