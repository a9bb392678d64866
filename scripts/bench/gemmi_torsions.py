#!/usr/bin/python3
"""Benchmark reference: gemmi reads each file and computes phi/psi/omega for every residue.

Usage: gemmi_torsions.py FILE... (or @LISTFILE). Prints JSON {"seconds" (wall), "cpu" (process
CPU time), "files", "residues", "phiDefined"} measured inside Python (interpreter start-up
excluded), for scripts/bench.sh.
"""
import json
import math
import sys
import time

import gemmi


def main():
    args = sys.argv[1:]
    files = []
    for a in args:
        if a.startswith("@"):
            with open(a[1:]) as f:
                files.extend(line.strip() for line in f if line.strip())
        else:
            files.append(a)
    t0 = time.perf_counter()
    c0 = time.process_time()
    residues = 0
    phi_defined = 0
    for path in files:
        st = gemmi.read_structure(path)
        for model in st:
            for ch in model:
                n = len(ch)
                prev = None
                for i in range(n):
                    res = ch[i]
                    nxt = ch[i + 1] if i + 1 < n else None
                    phi, psi = gemmi.calculate_phi_psi(prev, res, nxt)
                    if nxt is not None:
                        gemmi.calculate_omega(res, nxt)
                    if not math.isnan(phi):
                        phi_defined += 1
                    residues += 1
                    prev = res
    seconds = time.perf_counter() - t0
    cpu = time.process_time() - c0
    json.dump(
        {"seconds": seconds, "cpu": cpu, "files": len(files), "residues": residues, "phiDefined": phi_defined},
        sys.stdout,
    )


if __name__ == "__main__":
    main()
