"""Reference for the secondary-structure check: runs Debian's mkdssp (package dssp, 4.2) on a
file and prints [["chain:seq[icode]", code], ...] for every residue of its classic-format
output in file order (author numbers may repeat), with ' ' reported as '-'. PDB files get a HEADER record prepended (mkdssp 4.2 refuses PDB input
without one); gzip input is decompressed first. Usage: /usr/bin/python3 dssp_mkdssp.py FILE"""
import gzip
import json
import os
import subprocess
import sys
import tempfile

src = sys.argv[1]
data = open(src, 'rb').read()
name = os.path.basename(src)
if name.endswith('.gz'):
    data = gzip.decompress(data)
    name = name[:-3]
is_pdb = not name.lower().endswith('.cif')
if is_pdb and not data.startswith(b'HEADER'):
    data = b'HEADER    FOLDFOLIO REFERENCE RUN\n' + data
with tempfile.TemporaryDirectory() as tmp:
    inp = os.path.join(tmp, 'in.pdb' if is_pdb else 'in.cif')
    out = os.path.join(tmp, 'out.dssp')
    open(inp, 'wb').write(data)
    subprocess.run(['mkdssp', '--output-format', 'dssp', inp, out], check=True,
                   stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    lines = open(out).read().splitlines()
start = next(i for i, l in enumerate(lines) if l.startswith('  #  RESIDUE'))
result = []
for line in lines[start + 1:]:
    if len(line) < 17 or line[13] == '!':
        continue
    seq = int(line[5:10])
    icode = line[10].strip()
    chain = line[11]
    code = line[16]
    result.append([f'{chain}:{seq}{icode}', '-' if code == ' ' else code])
print(json.dumps(result))
