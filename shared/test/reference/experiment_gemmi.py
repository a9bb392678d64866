"""Reads experimental statistics with gemmi (Debian python3-gemmi), independently of Foldfolio.

Usage: /usr/bin/python3 experiment_gemmi.py FILE...  -> JSON {file: {key: value}}
mmCIF: the raw PDBx items via gemmi.cif; PDB: what gemmi itself parses from the header (CRYST1,
REMARK 2 resolution). Keys are the Foldfolio field keys the test compares.
"""
import json
import sys

import gemmi

CIF_ITEMS = {
    'resolutionHighA': '_reflns.d_resolution_high',
    'resolutionLowA': '_reflns.d_resolution_low',
    'reflectionsUnique': '_reflns.number_obs',
    'completenessPct': '_reflns.percent_possible_obs',
    'refineResolutionHighA': '_refine.ls_d_res_high',
    'refineResolutionLowA': '_refine.ls_d_res_low',
    'reflectionsRefinement': '_refine.ls_number_reflns_obs',
    'rWork': '_refine.ls_R_factor_R_work',
    'rFree': '_refine.ls_R_factor_R_free',
    'cellA': '_cell.length_a',
    'cellB': '_cell.length_b',
    'cellC': '_cell.length_c',
    'cellAlpha': '_cell.angle_alpha',
    'cellBeta': '_cell.angle_beta',
    'cellGamma': '_cell.angle_gamma',
    'spaceGroup': '_symmetry.space_group_name_H-M',
}
NUMERIC = set(CIF_ITEMS) - {'spaceGroup'}


def from_cif(path):
    block = gemmi.cif.read(path).sole_block()
    out = {}
    for key, item in CIF_ITEMS.items():
        v = block.find_value(item)
        if v is None or v in ('?', '.'):
            continue
        v = gemmi.cif.as_string(v)
        out[key] = float(v) if key in NUMERIC else v
    return out


def from_pdb(path):
    # gemmi 0.5 (Debian) parses CRYST1 and REMARK 2 resolution from a PDB file, not REMARK 3/200;
    # R values of a PDB file are checked against the same entry's mmCIF instead (see the test).
    st = gemmi.read_structure(path)
    out = {}
    if st.cell.a > 1.0:
        out.update(cellA=st.cell.a, cellB=st.cell.b, cellC=st.cell.c,
                   cellAlpha=st.cell.alpha, cellBeta=st.cell.beta, cellGamma=st.cell.gamma)
    if st.spacegroup_hm:
        out['spaceGroup'] = st.spacegroup_hm
    if st.resolution and st.resolution > 0:
        out['refineResolutionHighA'] = st.resolution
    return out


result = {}
for p in sys.argv[1:]:
    is_pdb = p.endswith(('.pdb', '.ent', '.pdb.gz', '.ent.gz'))
    result[p.split('/')[-1]] = from_pdb(p) if is_pdb else from_cif(p)
print(json.dumps(result))
