"""Reference for the Kabsch check: CA atoms of two models of one file, matched by
(chain, residue number, insertion code), and gemmi's least-squares superposition RMSD on them.
Usage: /usr/bin/python3 superpose_gemmi.py FILE MODEL_INDEX_A MODEL_INDEX_B  (0-based)
Prints JSON {"mobile": [x,y,z,...], "target": [...], "rmsd": float}."""
import json
import sys

import gemmi

st = gemmi.read_structure(sys.argv[1])
a, b = st[int(sys.argv[2])], st[int(sys.argv[3])]


def cas(model):
    out = {}
    for ch in model:
        for res in ch:
            ca = res.find_atom('CA', '*')
            if ca is not None:
                out[(ch.name, res.seqid.num, res.seqid.icode)] = ca.pos
    return out


ma, mb = cas(a), cas(b)
keys = [k for k in ma if k in mb]
mobile = [ma[k] for k in keys]
target = [mb[k] for k in keys]
sup = gemmi.superpose_positions(target, mobile)
print(json.dumps({
    "mobile": [c for p in mobile for c in (p.x, p.y, p.z)],
    "target": [c for p in target for c in (p.x, p.y, p.z)],
    "rmsd": sup.rmsd,
}))
