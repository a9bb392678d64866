#!/usr/bin/python3
"""Reference values for the engine's reader and torsion tests, from gemmi and Biopython.

Run with Debian's /usr/bin/python3 (python3-gemmi, python3-biopython). Prints one JSON object
keyed by file name. Torsions come from gemmi (atom selection with gemmi's altloc matching,
gemmi.calculate_dihedral, gemmi.calculate_phi_psi / calculate_omega) and chi angles from
Biopython's internal coordinates (Bio.PDB.internal_coords).
"""
import gzip
import io
import json
import math
import sys
import warnings

import gemmi

warnings.filterwarnings("ignore")


def deg(v):
    return None if v is None or math.isnan(v) else math.degrees(v)


def altlocs(res):
    return sorted({a.altloc for a in res if a.altloc != "\0"})


def pick(res, name, alt):
    """Atom `name` of conformer `alt` ('' = none): gemmi's find_atom matches that altloc or none."""
    a = res.find_atom(name, alt if alt else "*")
    return a


def dihedral(a, b, c, d):
    if a is None or b is None or c is None or d is None:
        return None
    return deg(gemmi.calculate_dihedral(a.pos, b.pos, c.pos, d.pos))


def connected(prev_c, n):
    # chain break: C(i-1)-N(i) > 2.0 A (common practice, no source) - same rule as the engine
    return prev_c is not None and n is not None and prev_c.pos.dist(n.pos) <= 2.0


def conformers_of(position):
    """(residue, altloc) pairs of one sequence position, residues in file order, altlocs sorted."""
    out = []
    for res in position:
        alts = altlocs(res)
        out.extend((res, a) for a in (alts or [""]))
    return out


def neighbour(position, alt):
    """Conformer of a neighbouring position paired with altloc `alt`: same altloc, else its first."""
    confs = conformers_of(position)
    if alt:
        for res, a in confs:
            if a == alt:
                return res, a
    return confs[0]


def positions(chain):
    """Consecutive residues sharing seqid (microheterogeneity) form one position."""
    out = []
    for res in chain:
        if out and out[-1][0].seqid == res.seqid:
            out[-1].append(res)
        else:
            out.append([res])
    return out


def model_info(model):
    chains = {}
    rows = []
    altloc_atoms = 0
    hydrogens = 0
    kinds = {"water": 0, "aminoAcid": 0, "nucleic": 0}
    for ch in model:
        info = chains.setdefault(ch.name, {"residues": 0, "atoms": 0})
        info["residues"] += len(ch)
        for res in ch:
            info["atoms"] += len(res)
            for a in res:
                if a.altloc != "\0":
                    altloc_atoms += 1
                if a.is_hydrogen():
                    hydrogens += 1
            if res.is_water():
                kinds["water"] += 1
                continue
            info_t = gemmi.find_tabulated_residue(res.name)
            if info_t is not None and info_t.is_amino_acid():
                kinds["aminoAcid"] += 1
            if info_t is not None and info_t.is_nucleic_acid():
                kinds["nucleic"] += 1
        pos = positions(ch)
        for gi, group in enumerate(pos):
            prev = pos[gi - 1] if gi > 0 else None
            nxt = pos[gi + 1] if gi + 1 < len(pos) else None
            for res, alt in conformers_of(group):
                if res.is_water():
                    continue
                n, ca, c = pick(res, "N", alt), pick(res, "CA", alt), pick(res, "C", alt)
                phi = psi = omega = None
                if prev is not None:
                    pres, palt = neighbour(prev, alt)
                    pc = pick(pres, "C", palt)
                    if not pres.is_water() and connected(pc, n):
                        phi = dihedral(pc, n, ca, c)
                if nxt is not None:
                    nres, nalt = neighbour(nxt, alt)
                    nn, nca = pick(nres, "N", nalt), pick(nres, "CA", nalt)
                    if not nres.is_water() and connected(c, nn):
                        psi = dihedral(n, ca, c, nn)
                        omega = dihedral(ca, c, nn, nca)
                row = {
                    "chain": ch.name, "seq": res.seqid.num, "icode": res.seqid.icode.strip(),
                    "name": res.name, "altloc": alt, "phi": phi, "psi": psi, "omega": omega,
                }
                if (
                    alt == "" and prev is not None and nxt is not None
                    and len(prev) == 1 and len(nxt) == 1 and len(group) == 1
                ):
                    # gemmi's own backbone functions (no altlocs or microheterogeneity here)
                    p, s_ = gemmi.calculate_phi_psi(prev[0], res, nxt[0])
                    row["gemmiPhi"], row["gemmiPsi"] = deg(p), deg(s_)
                    row["gemmiOmega"] = deg(gemmi.calculate_omega(res, nxt[0]))
                rows.append(row)
    return {"chains": chains, "altlocAtoms": altloc_atoms, "hydrogens": hydrogens, "kinds": kinds, "rows": rows}


def mod_residues(path):
    """_pdbx_struct_mod_residue (component, parent) pairs read by gemmi's CIF parser."""
    if ".cif" not in path:
        return []
    block = gemmi.cif.read(path).sole_block()
    table = block.find("_pdbx_struct_mod_residue.", ["label_comp_id", "parent_comp_id"])
    return sorted({(row[0], row[1]) for row in table})


def biopython_chi(path):
    from Bio.PDB import MMCIFParser, PDBParser

    opener = gzip.open if path.endswith(".gz") else open
    with opener(path, "rt") as f:
        text = f.read()
    parser = MMCIFParser(QUIET=True) if text.lstrip().startswith("data_") else PDBParser(QUIET=True)
    st = parser.get_structure("x", io.StringIO(text))
    model = next(iter(st))
    out = []
    for ch in model:
        try:
            ch.atom_to_internal_coordinates()
        except Exception as e:  # noqa: BLE001 - record and skip chains Biopython cannot handle
            out.append({"chain": ch.id, "error": str(e)})
            continue
        for res in ch:
            if res.is_disordered() or res.internal_coord is None:
                continue
            het, seq, icode = res.id
            chis = []
            for k in range(1, 6):
                v = res.internal_coord.get_angle("chi%d" % k)
                chis.append(None if v is None else float(v))
            out.append({"chain": ch.id, "seq": seq, "icode": icode.strip(), "name": res.get_resname(), "chi": chis})
    return out


def main():
    result = {}
    for path in sys.argv[1:]:
        name = path.rsplit("/", 1)[-1]
        entry = {}
        try:
            st = gemmi.read_structure(path)
            entry["models"] = len(st)
            entry["modelInfo"] = [model_info(m) for m in st]
            entry["modResidues"] = mod_residues(path)
        except Exception as e:  # noqa: BLE001
            entry["error"] = str(e)
        if "error" not in entry:
            try:
                entry["chi"] = biopython_chi(path)
            except Exception as e:  # noqa: BLE001
                entry["chiError"] = str(e)
        result[name] = entry
    json.dump(result, sys.stdout)


if __name__ == "__main__":
    main()
