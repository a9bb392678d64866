/**
 * The values a methods table can show, each with where it came from: the uploaded file (a
 * PDBx item or PDB REMARK), the form (the author's entry), or computed by the engine from the
 * model. Form entries override file values; computed values are never overridden.
 */
import { EXPERIMENT_FIELDS, type ExperimentalStats, type Report } from '@foldfolio/shared';

export type ValueOrigin = 'file' | 'form' | 'computed';

export interface TableValue {
  key: string;
  label: string;
  value: string | number | null;
  origin: ValueOrigin;
  /** PDBx item / REMARK for file values, 'form' for the form, a sentence for computed ones */
  source: string;
}

/** The form's entries: field key → value (null clears a file value). */
export type MethodsForm = Record<string, string | number | null>;

function pct(part: number, total: number): number | null {
  return total > 0 ? (100 * part) / total : null;
}

/** Model-quality values from the report (first model; NMR: model 1, the ensemble in its own rows). */
export function computedValues(report: Report): TableValue[] {
  const out: TableValue[] = [];
  const m = report.models[0];
  if (!m) return out;
  const s = m.summary;
  const add = (
    key: string,
    label: string,
    value: number | string | null | undefined,
    source: string,
  ) => {
    if (
      value !== null &&
      value !== undefined &&
      !(typeof value === 'number' && !Number.isFinite(value))
    )
      out.push({ key, label, value, origin: 'computed', source });
  };
  const c = s.composition;
  add('atomsProtein', 'Protein atoms', c.atomsByGroup.protein, 'counted in the model');
  add(
    'atomsLigand',
    'Ligand/ion atoms',
    (c.atomsByGroup.ligand ?? 0) + (c.atomsByGroup.ion ?? 0),
    'counted in the model',
  );
  add('atomsWater', 'Water atoms', c.atomsByGroup.water, 'counted in the model');
  add('residuesProtein', 'Protein residues', c.proteinResidues, 'counted in the model');
  for (const g of s.bFactors) {
    if (g.group === 'protein')
      add('bProtein', 'Mean B, protein (Å²)', g.mean, 'mean over protein atoms');
    if (g.group === 'ligand')
      add('bLigand', 'Mean B, ligands (Å²)', g.mean, 'mean over ligand atoms');
    if (g.group === 'water') add('bWater', 'Mean B, water (Å²)', g.mean, 'mean over water atoms');
  }
  add(
    'bondRmsdA',
    'Bond lengths RMSD (Å)',
    s.bonds.rmsd,
    'backbone vs Engh & Huber 2001; side chains vs the Foldfolio side-chain library',
  );
  add(
    'angleRmsdDeg',
    'Bond angles RMSD (°)',
    s.angles.rmsd,
    'backbone vs Engh & Huber 2001; side chains vs the Foldfolio side-chain library',
  );
  if (s.rama) {
    const o = s.rama.overall;
    add(
      'ramaFavoredPct',
      'Ramachandran favored (%)',
      pct(o.favored, o.total),
      'Foldfolio reference regions',
    );
    add(
      'ramaAllowedPct',
      'Ramachandran allowed (%)',
      pct(o.allowed, o.total),
      'Foldfolio reference regions',
    );
    add(
      'ramaOutlierPct',
      'Ramachandran outliers (%)',
      pct(o.outlier, o.total),
      'Foldfolio reference regions',
    );
  }
  if (s.rotamers)
    add(
      'rotamerOutlierPct',
      'Rotamer outliers (%)',
      pct(s.rotamers.outlier, s.rotamers.total),
      'Foldfolio side-chain reference',
    );
  if (s.overlaps)
    add(
      'severeOverlapsPer1000',
      'Severe overlaps per 1,000 atoms',
      s.overlaps.perThousandAtoms,
      'all-atom contacts ≥ 0.4 Å',
    );
  add(
    'cisPeptides',
    'cis peptides (non-Pro / Pro)',
    `${s.cisPeptides - s.cisProPeptides} / ${s.cisProPeptides}`,
    'peptide ω',
  );
  add('models', 'Models in the ensemble', report.models.length, 'counted in the file');
  if (report.ensemble && report.ensemble.caRmsdToFirstA.length > 1) {
    const r = report.ensemble.caRmsdToFirstA.slice(1);
    add(
      'ensembleCaRmsdA',
      'Mean CA RMSD to model 1 (Å)',
      r.reduce((a, b) => a + b, 0) / r.length,
      'Kabsch superposition on CA atoms',
    );
  }
  return out;
}

/** File values, then the form on top, then computed values. */
export function collectValues(
  stats: ExperimentalStats,
  report: Report,
  form: MethodsForm = {},
): Map<string, TableValue> {
  const labels = new Map(EXPERIMENT_FIELDS.map((f) => [f.key, f.label]));
  const kinds = new Map(EXPERIMENT_FIELDS.map((f) => [f.key, f.kind]));
  const values = new Map<string, TableValue>();
  for (const [key, v] of Object.entries(stats.values)) {
    values.set(key, {
      key,
      label: labels.get(key) ?? key,
      value: v.value,
      origin: 'file',
      source: v.source,
    });
  }
  for (const [key, raw] of Object.entries(form).sort(([a], [b]) => a.localeCompare(b))) {
    if (!labels.has(key))
      throw new Error(
        `The form has no field "${key}"; use one of the experimental fields (for example resolutionHighA, rFree).`,
      );
    if (raw === null || raw === '') {
      values.delete(key);
      continue;
    }
    let value: string | number = raw;
    if (kinds.get(key) === 'number') {
      const n = typeof raw === 'number' ? raw : Number(String(raw).trim());
      if (!Number.isFinite(n))
        throw new Error(
          `The form value for "${labels.get(key)}" must be a number; got "${String(raw)}".`,
        );
      value = n;
    }
    values.set(key, {
      key,
      label: labels.get(key)!,
      value,
      origin: 'form',
      source: 'entered in the form',
    });
  }
  for (const v of computedValues(report)) values.set(v.key, v);
  return values;
}
