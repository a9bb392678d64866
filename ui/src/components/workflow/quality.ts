// Plain-language cautions for the summary cards. Each threshold names its source.
import type { AnalysisSummaryDto, ResidueRow } from '@foldfolio/shared';
import { OUTLIER_FLAGS } from '@foldfolio/shared/api';

export interface SummaryCard {
  id: string;
  title: string;
  value: string;
  detail?: string;
  caution?: string;
}

const pctOf = (part: number | null, total: number | null) =>
  part === null || !total ? null : (100 * part) / total;
const fmt = (v: number | null, d = 2) => (v === null ? '—' : v.toFixed(d));

export function summaryCards(s: AnalysisSummaryDto, cisNonPro: number | null): SummaryCard[] {
  const cards: SummaryCard[] = [];
  const fav = pctOf(s.ramaFavored, s.ramaTotal);
  const out = pctOf(s.ramaOutliers, s.ramaTotal);
  cards.push({
    id: 'torsions',
    title: 'Backbone torsions',
    value: fav === null ? '—' : `${fav.toFixed(1)} % favored`,
    detail: `${s.ramaOutliers ?? '—'} outliers (${out === null ? '—' : out.toFixed(2)} %) of ${s.ramaTotal ?? '—'} residues`,
    // ≥ 98 % favored and ≤ 0.2 % outliers are what well-refined high-resolution structures reach
    // (Lovell et al. 2003, Proteins 50:437, contours from high-quality reference data)
    caution:
      out !== null && out > 0.2
        ? 'More residues fall outside the usual backbone regions than in a typical well-refined model. Look at each one against the density before submission.'
        : fav !== null && fav < 98
          ? 'Fewer residues than usual sit in the favored backbone regions; check the flagged stretches.'
          : undefined,
  });
  const rotOut = pctOf(s.rotamerOutliers, s.rotamerTotal);
  cards.push({
    id: 'rotamers',
    title: 'Side-chain rotamers',
    value: rotOut === null ? '—' : `${rotOut.toFixed(1)} % outliers`,
    detail: `${s.rotamerOutliers ?? '—'} of ${s.rotamerTotal ?? '—'} side chains`,
    // about 1 % rotamer outliers is a common target for well-refined models (from memory)
    caution:
      rotOut !== null && rotOut > 1
        ? 'Several side chains are in unusual conformations; check them against the density.'
        : undefined,
  });
  cards.push({
    id: 'overlaps',
    title: 'Atom overlaps',
    value: s.overlapsPer1000 === null ? '—' : `${fmt(s.overlapsPer1000)} per 1000 atoms`,
    detail: 'severe overlaps (≥ 0.4 Å) between non-bonded atoms',
    // single-digit values per 1000 atoms are typical of carefully refined models (from memory)
    caution:
      s.overlapsPer1000 !== null && s.overlapsPer1000 > 10
        ? 'Many atoms are closer than their radii allow. Look at the worst contacts; hydrogens placed by a program may explain some.'
        : undefined,
  });
  cards.push({
    id: 'bonds',
    title: 'Bond lengths',
    value: s.bondRmsd === null ? '—' : `RMSD ${fmt(s.bondRmsd, 3)} Å`,
    detail: `RMS-Z ${fmt(s.bondRmsz)}`,
    // RMS-Z well above 1 means deviations larger than the restraint library's own spread
    // (common practice, no source)
    caution:
      s.bondRmsz !== null && s.bondRmsz > 1.5
        ? 'Bond lengths deviate from ideal values more than expected; the geometry restraints may be too loose.'
        : undefined,
  });
  cards.push({
    id: 'angles',
    title: 'Bond angles',
    value: s.angleRmsd === null ? '—' : `RMSD ${fmt(s.angleRmsd)}°`,
    detail: `RMS-Z ${fmt(s.angleRmsz)}`,
    caution:
      s.angleRmsz !== null && s.angleRmsz > 1.5
        ? 'Bond angles deviate from ideal values more than expected.'
        : undefined,
  });
  cards.push({
    id: 'peptides',
    title: 'Peptide bonds',
    value: `${s.cisPeptides ?? '—'} cis · ${s.twistedPeptides ?? '—'} twisted`,
    detail: cisNonPro === null ? undefined : `${cisNonPro} cis not before proline`,
    // cis peptides not before proline occur at about 0.03 % of peptides
    // (Jabs, Weiss & Hilgenfeld 1999, J Mol Biol 286:291); twisted ones are rarer still
    caution:
      (s.twistedPeptides ?? 0) > 0 || (cisNonPro ?? 0) > 0
        ? 'Twisted peptides and cis peptides not before proline are rare in real proteins: make sure each one is supported by the density.'
        : undefined,
  });
  cards.push({
    id: 'cb',
    title: 'Cβ and chirality',
    value: `${s.cbOutliers ?? '—'} Cβ · ${s.dResidues ?? '—'} D`,
    detail: 'Cβ more than 0.25 Å from ideal; inverted Cα chirality',
    // well-refined models have no Cβ deviations > 0.25 Å (Lovell et al. 2003)
    caution:
      (s.cbOutliers ?? 0) > 0 || (s.dResidues ?? 0) > 0
        ? 'Some residues have a misplaced Cβ or inverted handedness — often a sign of a backbone or side chain built the wrong way round.'
        : undefined,
  });
  return cards;
}

// one list with the service's ledger (shared/src/report/flags.ts)
export { OUTLIER_FLAGS };

export function outlierCount(r: ResidueRow): number {
  let n = 0;
  for (const f of r.flags) if (OUTLIER_FLAGS.includes(f)) n++;
  return n;
}

/** cis peptides whose following residue is not proline (the peptide is stored on residue i). */
export function cisNonProline(rows: ResidueRow[]): number {
  let n = 0;
  for (let i = 0; i < rows.length; i++) {
    if (!rows[i].flags.includes('cis-peptide')) continue;
    const next = rows[i + 1];
    if (!next || next.chain !== rows[i].chain || (next.parent ?? next.name) !== 'PRO') n++;
  }
  return n;
}
