/**
 * Writing atoms as a PDBx/mmCIF `_atom_site` loop, and tiling the protein chains of a model into
 * a large synthetic model (benchmarks). Pure: no Node or DOM APIs.
 */
import { ResidueKind } from './types';
import type { Structure } from './types';

/** `_atom_site` items, in the column order every writer of ours uses (PDBx/mmCIF dictionary names). */
export const ATOM_SITE_FIELDS: readonly string[] = [
  'group_PDB',
  'id',
  'type_symbol',
  'label_atom_id',
  'label_alt_id',
  'label_comp_id',
  'label_asym_id',
  'label_entity_id',
  'label_seq_id',
  'pdbx_PDB_ins_code',
  'Cartn_x',
  'Cartn_y',
  'Cartn_z',
  'occupancy',
  'B_iso_or_equiv',
  'pdbx_formal_charge',
  'auth_seq_id',
  'auth_comp_id',
  'auth_asym_id',
  'auth_atom_id',
  'pdbx_PDB_model_num',
];

/** Header lines of an `_atom_site` loop with ATOM_SITE_FIELDS (rows follow, one per atom). */
export function atomSiteLoopHeader(): string[] {
  return ['loop_', ...ATOM_SITE_FIELDS.map((f) => `_atom_site.${f}`)];
}

/** Spacing of the copies, Å: far beyond any contact distance, so copies never touch. */
const TILE_SPACING = 150;

/**
 * mmCIF text of translated copies of the protein chains of `src` (first model) on a cubic grid,
 * cut off at `targetAtoms` atoms; chain ids get the copy number appended.
 */
export function tiledCif(src: Structure, targetAtoms: number): { text: string; atoms: number } {
  const m = src.models[0];
  const s = src.strings;
  const rows: number[] = [];
  for (let r = 0; r < m.residues.count; r++) {
    if (m.residues.kind[r] !== ResidueKind.Protein) continue;
    for (let a = m.residues.atomStart[r]; a < m.residues.atomEnd[r]; a++) rows.push(a);
  }
  const copies = Math.ceil(targetAtoms / rows.length);
  const side = Math.ceil(Math.cbrt(copies));
  const out: string[] = ['data_tiled', '#', ...atomSiteLoopHeader()];
  let id = 0;
  let written = 0;
  for (let c = 0; c < copies && written < targetAtoms; c++) {
    const dx = (c % side) * TILE_SPACING;
    const dy = (Math.floor(c / side) % side) * TILE_SPACING;
    const dz = Math.floor(c / (side * side)) * TILE_SPACING;
    for (const a of rows) {
      if (written >= targetAtoms) break;
      const r = m.atoms.residue[a];
      const chain = s[m.chains.authId[m.residues.chain[r]]] + c;
      const alt = s[m.atoms.altloc[a]] || '.';
      const ic = s[m.residues.icode[r]] || '?';
      const ls = m.residues.labelSeq[r];
      const seq = m.residues.authSeq[r];
      const name = s[m.atoms.name[a]];
      const comp = s[m.residues.name[r]];
      // -2147483648 (int32 minimum) marks a missing label_seq_id in the model arrays
      out.push(
        `ATOM ${++id} ${s[m.atoms.element[a]]} ${name} ${alt} ${comp} ${chain} 1 ${ls === -2147483648 ? seq : ls} ${ic} ` +
          `${(m.atoms.x[a] + dx).toFixed(3)} ${(m.atoms.y[a] + dy).toFixed(3)} ${(m.atoms.z[a] + dz).toFixed(3)} ` +
          `${m.atoms.occupancy[a].toFixed(2)} ${m.atoms.bIso[a].toFixed(2)} ? ${seq} ${comp} ${chain} ${name} 1`,
      );
      written++;
    }
  }
  out.push('#', '');
  return { text: out.join('\n'), atoms: written };
}
