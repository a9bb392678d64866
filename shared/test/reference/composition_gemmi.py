"""Reference for the composition checks, from gemmi (python3-gemmi) on the first model:
  b       - mean/min/max B over all atoms, waters (HOH) and protein main chain (N CA C O OXT of
            residues gemmi tabulates as amino acids);
  occ     - atoms with 0 < occupancy < 1, and with occupancy 0;
  gaps    - per polymer chain (gemmi's subchains), runs of entity positions (full_sequence,
            1-based) without a modelled residue (label_seq), as [auth chain, auth number of the
            last modelled residue before the run or None, length].
Usage: /usr/bin/python3 composition_gemmi.py FILE"""
import json
import sys

import gemmi

st = gemmi.read_structure(sys.argv[1])
st.setup_entities()
model = st[0]
groups = {'all': [], 'water': [], 'main-chain': []}
partial = zero = 0
for ch in model:
    for res in ch:
        info = gemmi.find_tabulated_residue(res.name)
        amino = info is not None and info.is_amino_acid()
        for a in res:
            groups['all'].append(a.b_iso)
            if res.name == 'HOH':
                groups['water'].append(a.b_iso)
            if amino and a.name in ('N', 'CA', 'C', 'O', 'OXT'):
                groups['main-chain'].append(a.b_iso)
            if a.occ <= 0:
                zero += 1
            elif a.occ < 1:
                partial += 1
b = {k: [sum(v) / len(v), min(v), max(v), len(v)] for k, v in groups.items() if v}
gaps = []
for ch in model:
    for sub in ch.subchains():
        ent = st.get_entity(sub.subchain_id()) if hasattr(st, 'get_entity') else None
        ent = st.get_entity_of(sub)
        if ent is None or ent.entity_type != gemmi.EntityType.Polymer or not ent.full_sequence:
            continue
        seen = {}
        for r in sub:
            if r.label_seq is not None and r.label_seq not in seen:
                seen[r.label_seq] = r.seqid.num
        last, run = None, 0
        for p in range(1, len(ent.full_sequence) + 1):
            if p not in seen:
                run += 1
                continue
            if run:
                gaps.append([ch.name, last, run])
            run, last = 0, seen[p]
        if run and seen:
            gaps.append([ch.name, last, run])
print(json.dumps({'b': b, 'occ': [partial, zero], 'gaps': gaps}))
