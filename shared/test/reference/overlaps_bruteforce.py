"""All-atom severe overlaps by brute force over every atom pair, with python3-gemmi reading the
file: an independent implementation of the rules in shared/src/validation/overlaps.ts.
Rules: Bondi 1964 radii; zero-occupancy atoms and water hydrogens take no part; deposited H are
moved along their bond (parent = nearest heavy atom within 1.5 A, compatible altloc; S-H 1.34) to the
electron-cloud X-H length (N 0.86, O 0.82, S 1.20; C: 0.96 with three H on the parent, 0.97
with two, else 0.98 when the parent has three heavy neighbours within 1.75 A, 0.93 otherwise);
different altlocs never meet; a water and a partially occupied atom never meet; bonds from
distance with covalent radii + 0.4 A, between residues only peptide C-N, S-S (unless a residue
is not one of the 20 standard amino acids) and links to ligands, never waters; pairs up to three
bonds apart excluded, four when an H takes part; H-bond allowances 0.8 A polar-H...N/O and 0.5 A
N/O...N/O; 0.5 A for O...C four bonds apart; severe >= 0.4 A.
For files whose residues all carry deposited H (no riding H are added), so both sides see the
same atoms.
Prints JSON: [[chainA, seqA, icodeA, nameA, altlocA, atomA, chainB, ..., overlap], ...].
"""
import json
import math
import sys

import gemmi

BONDI = {'H': 1.2, 'D': 1.2, 'C': 1.7, 'N': 1.55, 'O': 1.52, 'S': 1.8, 'SE': 1.9, 'P': 1.8}
COV = {'H': 0.31, 'D': 0.31, 'C': 0.76, 'N': 0.71, 'O': 0.66, 'S': 1.05, 'SE': 1.2, 'P': 1.07}
WATER = {'HOH', 'DOD', 'WAT', 'H2O'}
STANDARD = set('ALA ARG ASN ASP CYS GLN GLU GLY HIS ILE LEU LYS MET PHE PRO SER THR TRP TYR VAL'.split())
XH = {'N': 0.86, 'O': 0.82, 'S': 1.2, 'SE': 1.2}


def compatible(a, b):
    return not (a and b and a != b)


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
                if el not in BONDI or a.occ <= 0:
                    continue
                if kind == 'water' and el in ('H', 'D'):
                    continue
                alt = a.altloc if a.altloc != '\0' else ''
                pos = [a.pos.x, a.pos.y, a.pos.z]
                atoms.append([ch.name, res.seqid.num, res.seqid.icode.strip(), res.name, alt, a.name, el, pos, kind, id(res), a.occ])
    n = len(atoms)

    def dist(p, q):
        return math.sqrt(sum((p[k] - q[k]) ** 2 for k in range(3)))

    # deposited H to the electron-cloud length
    heavy = [i for i in range(n) if atoms[i][6] not in ('H', 'D')]
    parent = {}
    for i in range(n):
        if atoms[i][6] not in ('H', 'D'):
            continue
        best = None
        for a in heavy:
            if not compatible(atoms[i][4], atoms[a][4]):
                continue
            d = dist(atoms[i][7], atoms[a][7])
            if d <= 1.5 and (best is None or d < best[0]):
                best = (d, a)
        if best:
            parent[i] = best[1]
    hcount = {}
    for p in parent.values():
        hcount[p] = hcount.get(p, 0) + 1
    new_pos = {}
    for h, p in parent.items():
        ep = atoms[p][6]
        if ep in XH:
            length = XH[ep]
        elif ep == 'C':
            if hcount[p] >= 3:
                length = 0.96
            elif hcount[p] == 2:
                length = 0.97
            else:
                nb = sum(1 for a in heavy if a != p and compatible(atoms[p][4], atoms[a][4])
                         and dist(atoms[p][7], atoms[a][7]) <= 1.75)
                length = 0.98 if nb >= 3 else 0.93
        else:
            continue
        hp, pp = atoms[h][7], atoms[p][7]
        d = dist(hp, pp)
        new_pos[h] = [pp[k] + (hp[k] - pp[k]) / d * length for k in range(3)]
    for h, q in new_pos.items():
        atoms[h][7] = q

    adj = [set() for _ in range(n)]
    close = []
    for i in range(n):
        ai = atoms[i]
        for j in range(i + 1, n):
            aj = atoms[j]
            if ai[4] and aj[4] and ai[4] != aj[4]:
                continue
            if 'water' in (ai[8], aj[8]) and (ai[10] < 1 or aj[10] < 1):
                continue
            d = dist(ai[7], aj[7])
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
                        bonded = ({ei, ej} == {'C', 'N'} or (ei == 'S' and ej == 'S')
                                  or ai[3] not in STANDARD or aj[3] not in STANDARD)
            if bonded:
                adj[i].add(j)
                adj[j].add(i)
            else:
                close.append((i, j, d))

    def within(i, j, k):
        frontier = {i}
        seen = {i}
        for _ in range(k):
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
        has_h = ei in ('H', 'D') or ej in ('H', 'D')
        if raw < 0.4 or within(i, j, 4 if has_h else 3):
            continue
        allowance = 0.0
        if (polar_h(i) and ej in ('N', 'O')) or (polar_h(j) and ei in ('N', 'O')):
            allowance = 0.8
        elif ei in ('N', 'O') and ej in ('N', 'O'):
            allowance = 0.5
        elif {ei, ej} == {'O', 'C'} and within(i, j, 4):
            allowance = 0.5
        ov = raw - allowance
        if ov >= 0.4:
            out.append(list(atoms[i][:6]) + list(atoms[j][:6]) + [round(ov, 3)])
    print(json.dumps(out))


main(sys.argv[1])
