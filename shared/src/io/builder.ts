/**
 * Accumulates atom rows in file order (growable typed arrays, no object per atom) and cuts them
 * into models → chains → residues. Both the CIF and the PDB reader fill one of these.
 */
import type { InputFormat } from '../report/types';
import type {
  AtomColumns,
  ChainColumns,
  EntityInfo,
  Model,
  ResidueColumns,
  Structure,
} from '../model/types';
import {
  classifyResidue,
  MODIFIED_PARENTS,
  STANDARD_AMINO_ACIDS,
  STANDARD_NUCLEOTIDES,
} from './residue-tables';
import { StructureReadError } from './errors';
import { ResidueKind } from '../model/types';

export const NO_LABEL_SEQ = -2147483648;

function growF64(a: Float64Array, n: number): Float64Array {
  const b = new Float64Array(n);
  b.set(a);
  return b;
}
function growF32(a: Float32Array, n: number): Float32Array {
  const b = new Float32Array(n);
  b.set(a);
  return b;
}
function growI32(a: Int32Array, n: number): Int32Array {
  const b = new Int32Array(n);
  b.set(a);
  return b;
}
function growI8(a: Int8Array, n: number): Int8Array {
  const b = new Int8Array(n);
  b.set(a);
  return b;
}
function growU8(a: Uint8Array, n: number): Uint8Array {
  const b = new Uint8Array(n);
  b.set(a);
  return b;
}

export class StructureBuilder {
  readonly strings: string[] = [''];
  private readonly stringIndex = new Map<string, number>([['', 0]]);
  count = 0;
  private cap: number;
  x: Float64Array;
  y: Float64Array;
  z: Float64Array;
  occupancy: Float32Array;
  bIso: Float32Array;
  name: Int32Array;
  element: Int32Array;
  altloc: Int32Array;
  charge: Int8Array;
  hetatm: Uint8Array;
  serial: Int32Array;
  // residue/chain/model keys per atom
  modelNum: Int32Array;
  chainAuth: Int32Array;
  chainLabel: Int32Array;
  entity: Int32Array;
  resName: Int32Array;
  authSeq: Int32Array;
  labelSeq: Int32Array;
  icode: Int32Array;
  /** a reader may force a residue boundary before an atom (e.g. the PDB TER record) */
  residueBreak: Uint8Array;

  /** modified component → parent, from the file's own records (take precedence over the table) */
  readonly fileParents = new Map<string, string>();
  readonly entities: EntityInfo[] = [];

  constructor(initialCapacity = 1024) {
    const n = Math.max(16, initialCapacity);
    this.cap = n;
    this.x = new Float64Array(n);
    this.y = new Float64Array(n);
    this.z = new Float64Array(n);
    this.occupancy = new Float32Array(n);
    this.bIso = new Float32Array(n);
    this.name = new Int32Array(n);
    this.element = new Int32Array(n);
    this.altloc = new Int32Array(n);
    this.charge = new Int8Array(n);
    this.hetatm = new Uint8Array(n);
    this.serial = new Int32Array(n);
    this.modelNum = new Int32Array(n);
    this.chainAuth = new Int32Array(n);
    this.chainLabel = new Int32Array(n);
    this.entity = new Int32Array(n);
    this.resName = new Int32Array(n);
    this.authSeq = new Int32Array(n);
    this.labelSeq = new Int32Array(n);
    this.icode = new Int32Array(n);
    this.residueBreak = new Uint8Array(n);
  }

  intern(s: string): number {
    const i = this.stringIndex.get(s);
    if (i !== undefined) return i;
    const j = this.strings.length;
    this.strings.push(s);
    this.stringIndex.set(s, j);
    return j;
  }

  /** Reserve the next atom row and return its index. */
  next(): number {
    if (this.count === this.cap) this.grow(this.cap * 2);
    return this.count++;
  }

  private grow(n: number): void {
    this.cap = n;
    this.x = growF64(this.x, n);
    this.y = growF64(this.y, n);
    this.z = growF64(this.z, n);
    this.occupancy = growF32(this.occupancy, n);
    this.bIso = growF32(this.bIso, n);
    this.name = growI32(this.name, n);
    this.element = growI32(this.element, n);
    this.altloc = growI32(this.altloc, n);
    this.charge = growI8(this.charge, n);
    this.hetatm = growU8(this.hetatm, n);
    this.serial = growI32(this.serial, n);
    this.modelNum = growI32(this.modelNum, n);
    this.chainAuth = growI32(this.chainAuth, n);
    this.chainLabel = growI32(this.chainLabel, n);
    this.entity = growI32(this.entity, n);
    this.resName = growI32(this.resName, n);
    this.authSeq = growI32(this.authSeq, n);
    this.labelSeq = growI32(this.labelSeq, n);
    this.icode = growI32(this.icode, n);
    this.residueBreak = growU8(this.residueBreak, n);
  }

  private parentOf(name: string): string {
    if (STANDARD_AMINO_ACIDS.has(name) || STANDARD_NUCLEOTIDES.has(name)) return name;
    return this.fileParents.get(name) ?? MODIFIED_PARENTS.get(name) ?? name;
  }

  finish(format: InputFormat, gzip: boolean, id: string): Structure {
    const n = this.count;
    if (n === 0) {
      throw new StructureReadError(
        'The file contains no atom records (no ATOM/HETATM lines or _atom_site rows), so there is no model to analyse; upload the coordinate file rather than a header or sequence file.',
      );
    }
    const models: Model[] = [];
    const seenModels = new Set<number>();
    let start = 0;
    for (let i = 1; i <= n; i++) {
      if (i === n || this.modelNum[i] !== this.modelNum[start]) {
        const num = this.modelNum[start];
        if (seenModels.has(num)) {
          throw new StructureReadError(
            `Model ${num} appears in two separate places of the file (atom ${this.serial[i - 1]}); keep each model's atoms together and upload again.`,
            { item: 'model' },
          );
        }
        seenModels.add(num);
        models.push(this.cutModel(start, i));
        start = i;
      }
    }
    return { format, gzip, strings: this.strings, models, entities: this.entities, id };
  }

  /**
   * A non-standard component with N, CA and C that is peptide-bonded (C–N ≤ 2.0 Å, common
   * practice, no source) to a protein neighbour in the same chain is an amino acid of the
   * polymer (files without entity records, e.g. PDB HETATM groups inside a chain).
   */
  private promoteLinkedAminoAcids(atoms: AtomColumns, res: ResidueColumns, a0: number): void {
    const find = (r: number, nm: string): number => {
      const idx = this.stringIndex.get(nm);
      if (idx === undefined) return -1;
      for (let i = res.atomStart[r]; i < res.atomEnd[r]; i++) if (atoms.name[i] === idx) return i;
      return -1;
    };
    const linked = (c: number, n: number): boolean => {
      if (c < 0 || n < 0) return false;
      const dx = atoms.x[c] - atoms.x[n],
        dy = atoms.y[c] - atoms.y[n],
        dz = atoms.z[c] - atoms.z[n];
      return dx * dx + dy * dy + dz * dz <= 4.0;
    };
    const sameChain = (a: number, b: number): boolean =>
      this.chainAuth[a0 + res.atomStart[a]] === this.chainAuth[a0 + res.atomStart[b]];
    for (let r = 0; r < res.count; r++) {
      if (res.kind[r] !== ResidueKind.Ligand) continue;
      const n = find(r, 'N'),
        ca = find(r, 'CA'),
        c = find(r, 'C');
      if (n < 0 || ca < 0 || c < 0) continue;
      const before =
        r > 0 &&
        sameChain(r - 1, r) &&
        res.kind[r - 1] === ResidueKind.Protein &&
        linked(find(r - 1, 'C'), n);
      const after =
        r + 1 < res.count &&
        sameChain(r, r + 1) &&
        res.kind[r + 1] === ResidueKind.Protein &&
        linked(c, find(r + 1, 'N'));
      if (before || after) res.kind[r] = ResidueKind.Protein;
    }
  }

  private cutModel(a0: number, a1: number): Model {
    const count = a1 - a0;
    const whole = a0 === 0 && a1 === this.count;
    // one model: views on the builder's columns (no copy); several: own copies per model
    const cut = <T extends Float64Array | Float32Array | Int32Array | Int8Array | Uint8Array>(
      a: T,
    ): T => (whole ? a.subarray(a0, a1) : a.slice(a0, a1)) as T;
    const atoms: AtomColumns = {
      count,
      x: cut(this.x),
      y: cut(this.y),
      z: cut(this.z),
      occupancy: cut(this.occupancy),
      bIso: cut(this.bIso),
      name: cut(this.name),
      element: cut(this.element),
      altloc: cut(this.altloc),
      charge: cut(this.charge),
      hetatm: cut(this.hetatm),
      serial: cut(this.serial),
      residue: new Int32Array(count),
    };
    // residue boundaries
    const rStart: number[] = [];
    for (let i = a0; i < a1; i++) {
      if (
        i === a0 ||
        this.residueBreak[i] === 1 ||
        this.chainAuth[i] !== this.chainAuth[i - 1] ||
        this.chainLabel[i] !== this.chainLabel[i - 1] ||
        this.authSeq[i] !== this.authSeq[i - 1] ||
        this.icode[i] !== this.icode[i - 1] ||
        this.resName[i] !== this.resName[i - 1] ||
        this.labelSeq[i] !== this.labelSeq[i - 1]
      ) {
        rStart.push(i);
      }
    }
    const nr = rStart.length;
    const entityById = new Map<string, EntityInfo>();
    for (const e of this.entities) entityById.set(e.id, e);
    const residues: ResidueColumns = {
      count: nr,
      atomStart: new Int32Array(nr),
      atomEnd: new Int32Array(nr),
      chain: new Int32Array(nr),
      name: new Int32Array(nr),
      parent: new Int32Array(nr),
      authSeq: new Int32Array(nr),
      labelSeq: new Int32Array(nr),
      icode: new Int32Array(nr),
      kind: new Uint8Array(nr),
      labelAsym: new Int32Array(nr),
      modified: new Uint8Array(nr),
    };
    const parentCache = new Map<number, number>();
    const kindCache = new Map<number, ResidueKind>();
    // parents interned below only add names; keys use the count before them (names are older)
    const stringCount = this.strings.length + 1;
    const isHydrogen = new Uint8Array(this.strings.length);
    this.strings.forEach((v, i) => (isHydrogen[i] = v === 'H' || v === 'D' ? 1 : 0));
    for (let r = 0; r < nr; r++) {
      const s = rStart[r];
      const e = r + 1 < nr ? rStart[r + 1] : a1;
      residues.atomStart[r] = s - a0;
      residues.atomEnd[r] = e - a0;
      atoms.residue.fill(r, s - a0, e - a0);
      const nameIdx = this.resName[s];
      let parentIdx = parentCache.get(nameIdx);
      if (parentIdx === undefined) {
        parentIdx = this.intern(this.parentOf(this.strings[nameIdx]));
        parentCache.set(nameIdx, parentIdx);
      }
      residues.name[r] = nameIdx;
      residues.parent[r] = parentIdx;
      residues.modified[r] = parentIdx !== nameIdx ? 1 : 0;
      residues.authSeq[r] = this.authSeq[s];
      residues.labelSeq[r] = this.labelSeq[s];
      residues.icode[r] = this.icode[s];
      residues.labelAsym[r] = this.chainLabel[s];
      let heavy = 0;
      for (let i = s; i < e; i++) if (isHydrogen[this.element[i]] === 0) heavy++;
      // the kind depends on name, entity and whether the residue is monoatomic: cache on those
      const kindKey = (this.entity[s] * stringCount + nameIdx) * 2 + (heavy <= 1 ? 1 : 0);
      let kind = kindCache.get(kindKey);
      if (kind === undefined) {
        const ent = entityById.get(this.strings[this.entity[s]]);
        kind = classifyResidue(
          this.strings[nameIdx],
          this.strings[parentIdx],
          ent?.type,
          ent?.polymerType,
          heavy,
        );
        kindCache.set(kindKey, kind);
      }
      residues.kind[r] = kind;
    }
    this.promoteLinkedAminoAcids(atoms, residues, a0);
    // chain boundaries: contiguous runs of one auth chain id
    const cStart: number[] = [];
    for (let r = 0; r < nr; r++) {
      if (r === 0 || this.chainAuth[rStart[r]] !== this.chainAuth[rStart[r - 1]]) cStart.push(r);
    }
    const nc = cStart.length;
    const chains: ChainColumns = {
      count: nc,
      residueStart: new Int32Array(nc),
      residueEnd: new Int32Array(nc),
      authId: new Int32Array(nc),
      labelId: new Int32Array(nc),
      entity: new Int32Array(nc),
    };
    for (let c = 0; c < nc; c++) {
      const rs = cStart[c];
      const re = c + 1 < nc ? cStart[c + 1] : nr;
      chains.residueStart[c] = rs;
      chains.residueEnd[c] = re;
      chains.authId[c] = this.chainAuth[rStart[rs]];
      chains.labelId[c] = this.chainLabel[rStart[rs]];
      chains.entity[c] = this.entity[rStart[rs]];
      residues.chain.fill(c, rs, re);
    }
    return { num: this.modelNum[a0], atoms, residues, chains };
  }
}
