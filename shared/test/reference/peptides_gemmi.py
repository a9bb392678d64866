"""Reference values for the peptide and chirality checks, computed by gemmi on the first model
(alternate conformations reduced to the first one by gemmi):
  omega   - gemmi.calculate_omega for every pair of consecutive residues of a chain whose
            C(i)-N(i+1) distance is <= 2.0 A (chain-break rule, common practice, no source);
  chiral  - CA chiral volume (N-CA).((C-CA)x(CB-CA)) from gemmi's coordinates;
  bonds   - mean backbone bond lengths N-CA, CA-C, C-O and C-N(i+1) over the same residues.
Usage: /usr/bin/python3 peptides_gemmi.py FILE   -> JSON on stdout."""
import json
import math
import sys

import gemmi

st = gemmi.read_structure(sys.argv[1])
st.setup_entities()
st.remove_alternative_conformations()
model = st[0]
omega, chiral = [], []
sums = {'N-CA': [0.0, 0], 'CA-C': [0.0, 0], 'C-O': [0.0, 0], 'C-N+': [0.0, 0]}


def atom(res, name):
    a = res.find_atom(name, '*')
    return a.pos if a is not None else None


def acc(key, p, q):
    if p is not None and q is not None:
        sums[key][0] += p.dist(q)
        sums[key][1] += 1


# the 20 standard amino acids (modified residues are left out of this reference)
AMINO = {'ALA', 'ARG', 'ASN', 'ASP', 'CYS', 'GLN', 'GLU', 'GLY', 'HIS', 'ILE', 'LEU', 'LYS', 'MET',
         'PHE', 'PRO', 'SER', 'THR', 'TRP', 'TYR', 'VAL'}
for ch in model:
    residues = [r for r in ch if r.name in AMINO]
    for i, r in enumerate(residues):
        n, ca, c, o, cb = (atom(r, x) for x in ('N', 'CA', 'C', 'O', 'CB'))
        acc('N-CA', n, ca)
        acc('CA-C', ca, c)
        acc('C-O', c, o)
        key = [ch.name, r.seqid.num, r.seqid.icode.strip()]
        if n and ca and c and cb and r.name != 'GLY':
            chiral.append(key + [(n - ca).dot((c - ca).cross(cb - ca))])
        if i + 1 < len(residues):
            nx = residues[i + 1]
            nn = atom(nx, 'N')
            if c is not None and nn is not None and c.dist(nn) <= 2.0:
                acc('C-N+', c, nn)
                if ca is not None and atom(nx, 'CA') is not None:
                    omega.append(key + [math.degrees(gemmi.calculate_omega(r, nx)), nx.name])
print(json.dumps({'omega': omega, 'chiral': chiral,
                  'bonds': {k: v[0] / v[1] for k, v in sums.items() if v[1]}}))
