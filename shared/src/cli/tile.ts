/** Tiling real chains into a large model for benchmarks (Node edge helper, pure function). */
import { ResidueKind } from '../model/types';
import type { Structure } from '../model/types';

export /** mmCIF text of `copies` translated copies of the protein chains of `src` (first model). */
function tiledCif(src: Structure, targetAtoms: number): { text: string; atoms: number } {
  const m = src.models[0];
  const s = src.strings;
  const rows: number[] = [];
  for (let r = 0; r < m.residues.count; r++) {
    if (m.residues.kind[r] !== ResidueKind.Protein) continue;
    for (let a = m.residues.atomStart[r]; a < m.residues.atomEnd[r]; a++) rows.push(a);
  }
  const copies = Math.ceil(targetAtoms / rows.length);
  const side = Math.ceil(Math.cbrt(copies));
  const out: string[] = [
    'data_tiled',
    '#',
    'loop_',
    ...[
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
    ].map((f) => '_atom_site.' + f),
  ];
  let id = 0;
  let written = 0;
  for (let c = 0; c < copies && written < targetAtoms; c++) {
    // copies on a cubic grid 150 Å apart: no contacts between copies
    const dx = (c % side) * 150;
    const dy = (Math.floor(c / side) % side) * 150;
    const dz = Math.floor(c / (side * side)) * 150;
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
