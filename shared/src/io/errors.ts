/**
 * The one error type the readers throw. Its message is a sentence for the user: what is wrong,
 * where (line or item), and what to do next. Readers never return a partial structure.
 */
export class StructureReadError extends Error {
  /** 1-based line of the fault in the (decompressed) text, when known */
  readonly line: number | null;
  /** PDBx item or PDB record at fault, when known (e.g. '_atom_site.Cartn_x', 'ATOM') */
  readonly item: string | null;

  constructor(message: string, where: { line?: number | null; item?: string | null } = {}) {
    super(message);
    this.name = 'StructureReadError';
    this.line = where.line ?? null;
    this.item = where.item ?? null;
  }
}
