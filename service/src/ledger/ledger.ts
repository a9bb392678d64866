import {
  type AnalysisSummaryDto,
  type LedgerDto,
  type LedgerResidueChange,
  OUTLIER_FLAGS,
  type Report,
  type ResidueFlag,
  type Structure,
  superpose,
} from '@foldfolio/shared';
import { SUMMARY_KEYS } from '../analyses/summary.js';

// ResidueKind.Protein in shared/src/model/types.ts (a const enum the service cannot import)
const PROTEIN = 0;

export function residueKey(chain: string, seq: number, icode: string): string {
  return `${chain}:${seq}:${icode}`;
}

/**
 * CA positions of the first model's protein residues, keyed by chain + seq + icode. Where a CA
 * has alternate locations the first one written is used (common practice, no source).
 */
export function caPositions(s: Structure): Map<string, [number, number, number]> {
  const out = new Map<string, [number, number, number]>();
  const m = s.models[0];
  if (!m) return out;
  const ca = s.strings.indexOf('CA');
  if (ca < 0) return out;
  for (let r = 0; r < m.residues.count; r++) {
    if (m.residues.kind[r] !== PROTEIN) continue;
    const key = residueKey(
      s.strings[m.chains.authId[m.residues.chain[r]]],
      m.residues.authSeq[r],
      s.strings[m.residues.icode[r]],
    );
    if (out.has(key)) continue;
    for (let a = m.residues.atomStart[r]; a < m.residues.atomEnd[r]; a++) {
      if (m.atoms.name[a] === ca) {
        out.set(key, [m.atoms.x[a], m.atoms.y[a], m.atoms.z[a]]);
        break;
      }
    }
  }
  return out;
}

interface ResidueVerdicts {
  name: string;
  chain: string;
  seq: number;
  icode: string;
  flags: Set<ResidueFlag>;
}

/** Outlier flags per residue of the first model, all conformers merged. */
function verdicts(report: Report): Map<string, ResidueVerdicts> {
  const out = new Map<string, ResidueVerdicts>();
  for (const row of report.models[0]?.residues ?? []) {
    const key = residueKey(row.chain, row.seq, row.icode);
    let v = out.get(key);
    if (!v) {
      v = { name: row.name, chain: row.chain, seq: row.seq, icode: row.icode, flags: new Set() };
      out.set(key, v);
    }
    for (const f of row.flags) if (OUTLIER_FLAGS.includes(f)) v.flags.add(f);
  }
  return out;
}

const byResidue = (a: LedgerResidueChange, b: LedgerResidueChange) =>
  a.chain < b.chain
    ? -1
    : a.chain > b.chain
      ? 1
      : a.seq - b.seq || (a.icode < b.icode ? -1 : a.icode > b.icode ? 1 : 0);

export interface LedgerSide {
  id: string;
  n: number;
  structure: Structure;
  report: Report;
  summary: AnalysisSummaryDto;
}

/** What changed from `from` to `to`: CA superposition, outlier verdicts, summary values. */
export function compareVersions(from: LedgerSide, to: LedgerSide): LedgerDto {
  const caFrom = caPositions(from.structure);
  const caTo = caPositions(to.structure);
  const target: number[] = [];
  const mobile: number[] = [];
  for (const [key, p] of caFrom) {
    const q = caTo.get(key);
    if (!q) continue;
    target.push(...p);
    mobile.push(...q);
  }
  const matched = target.length / 3;
  // three points fix a rotation; fewer give no meaningful superposition
  const caRmsdA = matched >= 3 ? superpose(mobile, target).rmsdA : null;

  const vFrom = verdicts(from.report);
  const vTo = verdicts(to.report);
  const newOutliers: LedgerResidueChange[] = [];
  const fixedOutliers: LedgerResidueChange[] = [];
  for (const [key, after] of vTo) {
    const before = vFrom.get(key);
    if (!before) continue;
    const added = [...after.flags].filter((f) => !before.flags.has(f));
    const removed = [...before.flags].filter((f) => !after.flags.has(f));
    if (added.length === 0 && removed.length === 0) continue;
    const change: LedgerResidueChange = {
      chain: after.chain,
      seq: after.seq,
      icode: after.icode,
      name: after.name,
      before: [...before.flags].sort(),
      after: [...after.flags].sort(),
      added: added.sort(),
      removed: removed.sort(),
    };
    if (added.length > 0) newOutliers.push(change);
    if (removed.length > 0) fixedOutliers.push(change);
  }
  newOutliers.sort(byResidue);
  fixedOutliers.sort(byResidue);
  return {
    from: { id: from.id, n: from.n },
    to: { id: to.id, n: to.n },
    matchedCa: matched,
    caRmsdA,
    residuesOnlyInFrom: [...vFrom.keys()].filter((k) => !vTo.has(k)).length,
    residuesOnlyInTo: [...vTo.keys()].filter((k) => !vFrom.has(k)).length,
    newOutliers,
    fixedOutliers,
    deltas: SUMMARY_KEYS.map((key) => ({ key, from: from.summary[key], to: to.summary[key] })),
  };
}
