"""Reference for the version ledger: CA atoms of the first model of two files, matched by
(chain, residue number, insertion code), protein residues only, and gemmi's least-squares
superposition RMSD on them.
Usage: /usr/bin/python3 ledger_gemmi.py FROM_FILE TO_FILE
Prints JSON {"matched": int, "rmsd": float}."""
import json
import sys

import gemmi


def cas(path):
    st = gemmi.read_structure(path)
    st.setup_entities()
    out = {}
    for ch in st[0]:
        for res in ch:
            info = gemmi.find_tabulated_residue(res.name)
            if info is None or not info.is_amino_acid():
                continue
            ca = res.find_atom('CA', '*')
            key = (ch.name, res.seqid.num, res.seqid.icode.strip())
            if ca is not None and key not in out:
                out[key] = ca.pos
    return out


a, b = cas(sys.argv[1]), cas(sys.argv[2])
keys = [k for k in a if k in b]
sup = gemmi.superpose_positions([a[k] for k in keys], [b[k] for k in keys])
print(json.dumps({"matched": len(keys), "rmsd": sup.rmsd}))
