"""All-atom severe overlaps by brute force over every atom pair, with python3-gemmi reading the
file: an independent implementation of the rules in shared/src/validation/overlaps.ts (Bondi
1964 radii; bonds from distance with covalent radii + 0.4 A, between residues only peptide C-N,
S-S and links to ligands, never waters; pairs up to three bonds apart excluded; H-bond
allowances 0.8 A polar-H...N/O and 0.5 A N/O...N/O; severe >= 0.4 A). For files whose residues
all carry deposited H (no riding H are added), so both sides see the same atoms.
Prints JSON: [[chainA, seqA, icodeA, nameA, altlocA, atomA, chainB, ..., overlap], ...].
"""
import json
import math
import sys

import gemmi

BONDI = {'H': 1.2, 'D': 1.2, 'C': 1.7, 'N': 1.55, 'O': 1.52, 'S': 1.8, 'SE': 1.9, 'P': 1.8}
COV = {'H': 0.31, 'D': 0.31, 'C': 0.76, 'N': 0.71, 'O': 0.66, 'S': 1.05, 'SE': 1.2, 'P': 1.07}
WATER = {'HOH', 'DOD', 'WAT', 'H2O'}


def main(path):
    st = gemmi.read_structure(path)
    st.setup_entities()
    atoms = []
    for ch in st[0]:
        for res in ch:
            ent = res.entity_type
            kind = 'water' if res.name in WATER else ('protein' if ent == gemmi.EntityType.Polymer else 'other')
            for a in res:
                el = a.element.name.upper()
                if el not in BONDI:
                    continue
                alt = a.altloc if a.altloc != '\0' else ''
                atoms.append((ch.name, res.seqid.num, res.seqid.icode.strip(), res.name, alt, a.name, el, a.pos, kind, id(res)))
    n = len(atoms)
    adj = [set() for _ in range(n)]
    close = []
    for i in range(n):
        ai = atoms[i]
        for j in range(i + 1, n):
            aj = atoms[j]
            if ai[4] and aj[4] and ai[4] != aj[4]:
                continue
            d = ai[7].dist(aj[7])
            if d > 3.4:
                continue
            ei, ej = ai[6], aj[6]
            bonded = False
            if d < COV[ei] + COV[ej] + 0.4 and not (ei in 'HD' and ej in 'HD'):
                bonded = True
                if ai[9] != aj[9]:
                    if ai[8] == 'water' or aj[8] == 'water':
                        bonded = False
                    elif ai[8] == 'protein' and aj[8] == 'protein':
                        bonded = {ei, ej} == {'C', 'N'} or (ei == 'S' and ej == 'S')
            if bonded:
                adj[i].add(j)
                adj[j].add(i)
            else:
                close.append((i, j, d))

    def within3(i, j):
        frontier = {i}
        seen = {i}
        for _ in range(3):
            frontier = {b for a in frontier for b in adj[a]} - seen
            if j in frontier:
                return True
            seen |= frontier
        return False

    def polar_h(i):
        return atoms[i][6] in ('H', 'D') and any(atoms[b][6] in ('N', 'O') for b in adj[i])

    out = []
    for i, j, d in close:
        ei, ej = atoms[i][6], atoms[j][6]
        raw = BONDI[ei] + BONDI[ej] - d
        if raw < 0.4 or within3(i, j):
            continue
        allowance = 0.0
        if (polar_h(i) and ej in ('N', 'O')) or (polar_h(j) and ei in ('N', 'O')):
            allowance = 0.8
        elif ei in ('N', 'O') and ej in ('N', 'O'):
            allowance = 0.5
        ov = raw - allowance
        if ov >= 0.4:
            out.append(list(atoms[i][:6]) + list(atoms[j][:6]) + [round(ov, 3)])
    print(json.dumps(out))


main(sys.argv[1])
