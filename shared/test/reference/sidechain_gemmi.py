"""Reference side-chain bond lengths and angles computed by gemmi on the first model.
For each requested term (RESNAME:ATOM-ATOM or RESNAME:ATOM-ATOM-ATOM) every residue of that
name contributes one value per compatible altloc combination (atoms with the same altloc, or
without one), as gemmi's coordinates give them (Position.dist, gemmi.calculate_angle in degrees).
Usage: /usr/bin/python3 sidechain_gemmi.py FILE TERM [TERM ...]   -> JSON on stdout:
  { TERM: [ { "chain", "seq", "icode", "value" }, ... ] }"""
import json
import math
import sys

import gemmi

st = gemmi.read_structure(sys.argv[1])
model = st[0]
out = {}
for term in sys.argv[2:]:
    resname, names = term.split(':')
    names = names.split('-')
    rows = []
    for ch in model:
        for res in ch:
            if res.name != resname:
                continue
            picks = [[a for a in res if a.name == n] for n in names]
            if any(not p for p in picks):
                continue
            # compatible altloc combinations: one altloc (or none) shared by all atoms
            alts = sorted({a.altloc for p in picks for a in p if a.altloc != '\0'}) or ['\0']
            seen = set()
            for alt in alts:
                chosen = []
                for p in picks:
                    same = [a for a in p if a.altloc == alt]
                    blank = [a for a in p if a.altloc == '\0']
                    chosen.append((same or blank or [None])[0])
                if any(a is None for a in chosen):
                    continue
                key = tuple(id(a) for a in chosen)
                if key in seen:
                    continue
                seen.add(key)
                if len(chosen) == 2:
                    v = chosen[0].pos.dist(chosen[1].pos)
                else:
                    v = math.degrees(gemmi.calculate_angle(chosen[0].pos, chosen[1].pos, chosen[2].pos))
                rows.append({'chain': ch.name, 'seq': res.seqid.num,
                             'icode': res.seqid.icode.strip(), 'value': v})
    out[term] = rows
print(json.dumps(out))
