"""Independent cis-peptide and C-beta definitions (SCIENCE.md) computed with python3-gemmi.

For the first model of a file: per residue without alternate locations, omega to the next
residue (gemmi.calculate_omega) and the distance of CB from an ideal CB built the way Lovell et
al. 2003 describe (from memory): placed twice by internal coordinates, once from the N side
(C-N-CA-CB -122.6 deg, N-CA-CB 110.4 deg) and once from the C side (N-C-CA-CB 122.6 deg,
C-CA-CB 110.1 deg), CA-CB 1.530 A (Engh & Huber 1991 values, from memory), and averaged.
Prints JSON: [[chain, seq, icode, name, omega_or_null, cbdev_or_null], ...].
"""
import json
import math
import sys

import gemmi


def _sub(p, q):
    return (p[0] - q[0], p[1] - q[1], p[2] - q[2])


def _cross(p, q):
    return (p[1] * q[2] - p[2] * q[1], p[2] * q[0] - p[0] * q[2], p[0] * q[1] - p[1] * q[0])


def _unit(p):
    n = math.sqrt(p[0] ** 2 + p[1] ** 2 + p[2] ** 2)
    return (p[0] / n, p[1] / n, p[2] / n)


def place(a, b, c, bond, angle_deg, torsion_deg):
    """Point d with |cd| = bond, angle b-c-d and torsion a-b-c-d (degrees); tuples in, tuple out."""
    bc = _unit(_sub(c, b))
    n = _unit(_cross(_sub(b, a), bc))
    m = _cross(n, bc)
    th = math.radians(angle_deg)
    ph = math.radians(torsion_deg)
    d = (-bond * math.cos(th), bond * math.sin(th) * math.cos(ph), bond * math.sin(th) * math.sin(ph))
    return tuple(c[k] + d[0] * bc[k] + d[1] * m[k] + d[2] * n[k] for k in range(3))


def main(path):
    st = gemmi.read_structure(path)
    st.setup_entities()
    model = st[0]
    out = []
    for chain in model:
        poly = chain.get_polymer()
        n = len(poly)
        for i in range(n):
            res = poly[i]
            if any(a.altloc != '\0' for a in res):
                continue
            omega = None
            if i + 1 < n:
                nxt = poly[i + 1]
                c_at = res.find_atom('C', '*')
                n_at = nxt.find_atom('N', '*')
                linked = c_at is not None and n_at is not None and c_at.pos.dist(n_at.pos) <= 2.0  # break rule, SCIENCE.md
                if not any(a.altloc != '\0' for a in nxt) and linked:
                    omega = math.degrees(gemmi.calculate_omega(res, nxt))
                    if math.isnan(omega):
                        omega = None
            cbdev = None
            try:
                N, CA, C, CB = (tuple(res[x][0].pos.tolist()) for x in ('N', 'CA', 'C', 'CB'))
                p1 = place(C, N, CA, 1.530, 110.4, -122.6)
                p2 = place(N, C, CA, 1.530, 110.1, 122.6)
                ideal = tuple((p1[k] + p2[k]) / 2 for k in range(3))
                cbdev = math.dist(CB, ideal)
            except (RuntimeError, IndexError):
                pass
            out.append([chain.name, res.seqid.num, res.seqid.icode.strip(), res.name, omega, cbdev])
    print(json.dumps(out))


main(sys.argv[1])
