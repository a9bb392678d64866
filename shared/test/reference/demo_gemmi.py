"""Reference for the demo-model check: reads an mmCIF file with gemmi (python3-gemmi) and prints
its chains, residue and atom counts, every peptide with |omega| < 150 deg (gemmi.calculate_omega),
residues with a negative CA chiral volume, the longest N-CA bond, and the number of atom pairs
closer than 2.2 A that are not in the same or adjacent residues (gemmi.ContactSearch).
Usage: /usr/bin/python3 demo_gemmi.py FILE"""
import json
import math
import sys

import gemmi

st = gemmi.read_structure(sys.argv[1])
model = st[0]
out = {'chains': [], 'residues': 0, 'atoms': 0, 'nonTrans': [], 'negativeChiral': [], 'longestNCA': None}
longest = (0.0, None)
for ch in model:
    out['chains'].append(ch.name)
    res = list(ch)
    out['residues'] += len(res)
    for i, r in enumerate(res):
        out['atoms'] += len(r)
        a = {x.name: x.pos for x in r}
        if 'N' in a and 'CA' in a:
            d = a['N'].dist(a['CA'])
            if d > longest[0]:
                longest = (d, [ch.name, r.seqid.num])
        if all(k in a for k in ('N', 'CA', 'C', 'CB')):
            ca = a['CA']
            if (a['N'] - ca).dot((a['C'] - ca).cross(a['CB'] - ca)) < 0:
                out['negativeChiral'].append([ch.name, r.seqid.num])
        if i + 1 < len(res):
            w = math.degrees(gemmi.calculate_omega(r, res[i + 1]))
            if abs(w) < 150:
                out['nonTrans'].append([ch.name, r.seqid.num, w])
out['longestNCA'] = [longest[0]] + longest[1]
ns = gemmi.NeighborSearch(model, st.cell, 5).populate()
cs = gemmi.ContactSearch(2.2)
cs.ignore = gemmi.ContactSearch.Ignore.AdjacentResidues
out['clashes'] = len(cs.find_contacts(ns))
print(json.dumps(out))
