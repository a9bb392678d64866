/**
 * PDBx/mmCIF (text) and BinaryCIF reader: Mol*'s CIF tokenizer/decoder parses the file; we fill
 * the typed-array hierarchy from `_atom_site` and read entities and modification records.
 */
import { CIF, CifBlock } from 'molstar/lib/commonjs/mol-io/reader/cif';
import type { CifCategory, CifField } from 'molstar/lib/commonjs/mol-io/reader/cif';
import type { Structure } from '../model/types';
import type { EntityInfo } from '../model/types';
import { NO_LABEL_SEQ, StructureBuilder } from './builder';
import { StructureReadError } from './errors';
import { fillAtomSite } from './cif-atom-site';
import type { AtomSiteScan } from './cif-atom-site';

const PRESENT = 0; // Column.ValueKind.Present in Mol*

function present(f: CifField | undefined, row: number): boolean {
  return f !== undefined && f.valueKind(row) === PRESENT;
}

function strOr(f: CifField | undefined, row: number, dflt: string): string {
  return f !== undefined && f.valueKind(row) === PRESENT ? f.str(row) : dflt;
}

export async function parseCifText(text: string): Promise<CifBlock> {
  return firstBlockWithAtoms(await parseCifTextBlocks(text));
}

/** All data blocks; `mapLine` turns a line of `text` into a line of the original file. */
export async function parseCifTextBlocks(
  text: string,
  mapLine: (line: number) => number = (l) => l,
): Promise<ReadonlyArray<CifBlock>> {
  const parsed = await CIF.parseText(text).run();
  if (parsed.isError) {
    const line = mapLine(parsed.line);
    throw new StructureReadError(
      `The mmCIF file could not be parsed at line ${line}: ${parsed.message} The file may be truncated or damaged; export it again from the refinement program and upload the complete file.`,
      { line },
    );
  }
  return parsed.result.blocks;
}

export async function parseBinaryCif(bytes: Uint8Array): Promise<CifBlock> {
  let parsed;
  try {
    parsed = await CIF.parseBinary(bytes).run();
  } catch (e) {
    throw new StructureReadError(
      `The BinaryCIF data could not be decoded (${e instanceof Error ? e.message : String(e)}); the file may be truncated or not BinaryCIF. Download it again or upload the mmCIF text version.`,
      { item: 'BinaryCIF' },
    );
  }
  if (parsed.isError) {
    throw new StructureReadError(
      `The BinaryCIF data could not be decoded: ${parsed.message} Download it again or upload the mmCIF text version.`,
      { item: 'BinaryCIF' },
    );
  }
  return firstBlockWithAtoms(parsed.result.blocks);
}

export function firstBlockWithAtoms(blocks: ReadonlyArray<CifBlock>): CifBlock {
  if (blocks.length === 0) {
    throw new StructureReadError(
      'The CIF file has no data block (no line starting with data_); upload a PDBx/mmCIF coordinate file.',
      { item: 'data_' },
    );
  }
  for (const b of blocks) if (b.categories['atom_site'] !== undefined) return b;
  return blocks[0];
}

function readEntities(block: CifBlock): EntityInfo[] {
  const out: EntityInfo[] = [];
  const byId = new Map<string, EntityInfo>();
  const ent = block.categories['entity'];
  if (ent !== undefined) {
    const id = ent.getField('id');
    const type = ent.getField('type');
    for (let r = 0; r < ent.rowCount; r++) {
      const eid = strOr(id, r, '');
      const t = strOr(type, r, 'unknown').toLowerCase();
      const known = ['polymer', 'non-polymer', 'water', 'branched', 'macrolide'];
      const info: EntityInfo = {
        id: eid,
        type: (known.includes(t) ? t : 'unknown') as EntityInfo['type'],
      };
      out.push(info);
      byId.set(eid, info);
    }
  }
  const poly = block.categories['entity_poly'];
  if (poly !== undefined) {
    const id = poly.getField('entity_id');
    const type = poly.getField('type');
    for (let r = 0; r < poly.rowCount; r++) {
      const e = byId.get(strOr(id, r, ''));
      if (e !== undefined) e.polymerType = strOr(type, r, '');
    }
  }
  const seq = block.categories['entity_poly_seq'];
  if (seq !== undefined) {
    const id = seq.getField('entity_id');
    const num = seq.getField('num');
    const mon = seq.getField('mon_id');
    let lastKey = '';
    for (let r = 0; r < seq.rowCount; r++) {
      const eid = strOr(id, r, '');
      const e = byId.get(eid);
      if (e === undefined) continue;
      // microheterogeneity: several mon_id share one num; keep the first
      const key = `${eid}:${strOr(num, r, '')}`;
      if (key === lastKey) continue;
      lastKey = key;
      (e.sequence ??= []).push(strOr(mon, r, '?'));
    }
  }
  return out;
}

function readModParents(block: CifBlock, b: StructureBuilder): void {
  const mod = block.categories['pdbx_struct_mod_residue'];
  if (mod === undefined) return;
  const comp = mod.getField('label_comp_id') ?? mod.getField('auth_comp_id');
  const parent = mod.getField('parent_comp_id');
  for (let r = 0; r < mod.rowCount; r++) {
    if (present(comp, r) && present(parent, r)) b.fileParents.set(comp!.str(r), parent!.str(r));
  }
}

function requireField(cat: CifCategory, ...names: string[]): CifField {
  for (const n of names) {
    const f = cat.getField(n);
    if (f !== undefined) return f;
  }
  throw new StructureReadError(
    `The _atom_site table has no _atom_site.${names[0]} column, which every model needs; export the model again with full atom records.`,
    { item: `_atom_site.${names[0]}` },
  );
}

/** Intern a string column, reusing the previous row's index when the value repeats. */
function internColumn(
  b: StructureBuilder,
  f: CifField | undefined,
  row: number,
  prev: number,
  dflt: string,
  upper = false,
): number {
  if (f === undefined) return b.intern(dflt);
  if (row > 0 && prev >= 0 && f.areValuesEqual(row, row - 1)) return prev;
  if (f.valueKind(row) !== PRESENT) return b.intern(dflt);
  const s = f.str(row);
  return b.intern(upper ? s.toUpperCase() : s);
}

/** A data block without categories (Mol* returns no block for `data_x` with nothing in it). */
export function emptyCifBlock(header: string): CifBlock {
  return CifBlock([], {}, header);
}

/** A builder with the block's entities and modification records. */
function builderFor(block: CifBlock, rows: number): StructureBuilder {
  const b = new StructureBuilder(rows);
  for (const e of readEntities(block)) b.entities.push(e);
  readModParents(block, b);
  return b;
}

/** mmCIF through the `_atom_site` fast path: rows from the byte scan, the rest from `block`. */
export function scannedCifToStructure(
  block: CifBlock,
  bytes: Uint8Array,
  scan: AtomSiteScan,
  gzip: boolean,
): Structure {
  // ~80 bytes per _atom_site row in archive files: a first guess of the row count
  const b = builderFor(block, Math.ceil((scan.dataEnd - scan.dataStart) / 80));
  fillAtomSite(bytes, scan, b);
  if (b.count === 0) {
    throw new StructureReadError(
      `The CIF data block "${block.header}" has no _atom_site rows, so there are no atoms to analyse; upload the coordinate file (PDBx/mmCIF with _atom_site), not a dictionary or header file.`,
      { item: '_atom_site' },
    );
  }
  return b.finish('mmcif', gzip, block.header);
}

export function blockToStructure(
  block: CifBlock,
  format: 'mmcif' | 'bcif',
  gzip: boolean,
): Structure {
  const site = block.categories['atom_site'];
  if (site === undefined || site.rowCount === 0) {
    throw new StructureReadError(
      `The CIF data block "${block.header}" has no _atom_site rows, so there are no atoms to analyse; upload the coordinate file (PDBx/mmCIF with _atom_site), not a dictionary or header file.`,
      { item: '_atom_site' },
    );
  }
  const n = site.rowCount;
  const b = builderFor(block, n);

  const fx = requireField(site, 'Cartn_x');
  const fy = requireField(site, 'Cartn_y');
  const fz = requireField(site, 'Cartn_z');
  const fAtom = requireField(site, 'auth_atom_id', 'label_atom_id');
  const fComp = requireField(site, 'auth_comp_id', 'label_comp_id');
  const fAuthAsym = site.getField('auth_asym_id');
  const fLabelAsym = site.getField('label_asym_id');
  if (fAuthAsym === undefined && fLabelAsym === undefined) requireField(site, 'auth_asym_id');
  const fAuthSeq = site.getField('auth_seq_id');
  const fLabelSeq = site.getField('label_seq_id');
  const fIcode = site.getField('pdbx_PDB_ins_code');
  const fAlt = site.getField('label_alt_id');
  const fType = site.getField('type_symbol');
  const fOcc = site.getField('occupancy');
  const fB = site.getField('B_iso_or_equiv');
  const fCharge = site.getField('pdbx_formal_charge');
  const fGroup = site.getField('group_PDB');
  const fId = site.getField('id');
  const fModel = site.getField('pdbx_PDB_model_num');
  const fEntity = site.getField('label_entity_id');
  let pHet = 0;

  let pAtom = -1,
    pComp = -1,
    pAuth = -1,
    pLabel = -1,
    pIcode = -1,
    pAlt = -1,
    pType = -1,
    pEnt = -1;
  for (let r = 0; r < n; r++) {
    const i = b.next();
    const x = fx.float(r),
      y = fy.float(r),
      z = fz.float(r);
    // '?' and '.' read as 0 in Mol*'s fast float parser: only zeros need the value-kind check
    if (
      !Number.isFinite(x) ||
      !Number.isFinite(y) ||
      !Number.isFinite(z) ||
      (x === 0 && fx.valueKind(r) !== PRESENT) ||
      (y === 0 && fy.valueKind(r) !== PRESENT) ||
      (z === 0 && fz.valueKind(r) !== PRESENT)
    ) {
      throw new StructureReadError(
        `Row ${r + 1} of _atom_site (atom id ${strOr(fId, r, '?')}) has a missing or non-numeric coordinate in _atom_site.Cartn_x/y/z; fix or remove that atom and upload again.`,
        { item: '_atom_site.Cartn_x' },
      );
    }
    b.x[i] = x;
    b.y[i] = y;
    b.z[i] = z;
    b.occupancy[i] = fOcc === undefined ? 1 : fOcc.float(r) || (present(fOcc, r) ? 0 : 1);
    b.bIso[i] = fB === undefined ? 0 : fB.float(r);
    pAtom = b.name[i] = internColumn(b, fAtom, r, pAtom, '');
    pComp = b.resName[i] = internColumn(b, fComp, r, pComp, '');
    pLabel = b.chainLabel[i] = internColumn(b, fLabelAsym ?? fAuthAsym, r, pLabel, '');
    pAuth = b.chainAuth[i] =
      fAuthAsym !== undefined ? internColumn(b, fAuthAsym, r, pAuth, '') : pLabel;
    pIcode = b.icode[i] = internColumn(b, fIcode, r, pIcode, '');
    pAlt = b.altloc[i] = internColumn(b, fAlt, r, pAlt, '');
    pType = b.element[i] = internColumn(b, fType, r, pType, '', true);
    pEnt = b.entity[i] = internColumn(b, fEntity, r, pEnt, '');
    // within a residue most columns repeat the previous row: reuse instead of re-parsing
    const ls =
      r > 0 && fLabelSeq !== undefined && fLabelSeq.areValuesEqual(r, r - 1)
        ? b.labelSeq[i - 1]
        : present(fLabelSeq, r)
          ? fLabelSeq!.int(r)
          : NO_LABEL_SEQ;
    b.labelSeq[i] = ls;
    b.authSeq[i] =
      r > 0 && fAuthSeq !== undefined && fAuthSeq.areValuesEqual(r, r - 1)
        ? b.authSeq[i - 1]
        : present(fAuthSeq, r)
          ? fAuthSeq!.int(r)
          : ls === NO_LABEL_SEQ
            ? 0
            : ls;
    b.modelNum[i] =
      r > 0 && fModel !== undefined && fModel.areValuesEqual(r, r - 1)
        ? b.modelNum[i - 1]
        : present(fModel, r)
          ? fModel!.int(r)
          : 1;
    b.serial[i] = fId !== undefined ? fId.int(r) : r + 1;
    if (r > 0 && fCharge !== undefined && fCharge.areValuesEqual(r, r - 1)) {
      b.charge[i] = b.charge[i - 1];
    } else if (present(fCharge, r)) {
      const c = fCharge!.int(r);
      if (!Number.isFinite(c) || c < -8 || c > 8) {
        throw new StructureReadError(
          `Row ${r + 1} of _atom_site (atom id ${strOr(fId, r, '?')}) has an impossible _atom_site.pdbx_formal_charge "${fCharge!.str(r)}"; correct it (an integer such as -1 or 2) and upload again.`,
          { item: '_atom_site.pdbx_formal_charge' },
        );
      }
      b.charge[i] = c;
    }
    if (fGroup !== undefined) {
      if (r === 0 || !fGroup.areValuesEqual(r, r - 1)) pHet = fGroup.str(r) === 'HETATM' ? 1 : 0;
      b.hetatm[i] = pHet;
    }
  }
  return b.finish(format, gzip, block.header);
}
