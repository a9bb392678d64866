/**
 * `foldfolio report <file> [--json] [--model N] [--geometry-only]` — command logic (Node edge: reads the file,
 * writes to stdout/stderr). Exit codes: 0 done, 2 bad input or usage (one-line reason).
 */
import { readFileSync, statSync } from 'node:fs';
import { basename } from 'node:path';
import { buildReport } from '../report/build';
import { nodeGunzip } from './node-gunzip';
import { nodeSha256 } from './node-sha256';
import { StructureReadError } from '../io/errors';
import type { ModelReport, Report } from '../report/types';

export interface CommandIo {
  out: (text: string) => void;
  err: (text: string) => void;
}

export const REPORT_USAGE = 'usage: foldfolio report <file> [--json] [--model N] [--geometry-only]';

const FORMAT_NAME: Record<string, string> = { mmcif: 'PDBx/mmCIF', bcif: 'BinaryCIF', pdb: 'PDB' };

function count(n: number, word: string, plural = word + 's'): string {
  return `${n.toLocaleString('en-US')} ${n === 1 ? word : plural}`;
}

function definedCount(m: ModelReport, key: 'phi' | 'psi' | 'omega'): number {
  let n = 0;
  for (const r of m.residues) if (r[key] !== null) n++;
  return n;
}

/** "n favored (p %), n allowed (p %), n outliers (p %) of total" */
function verdictCounts(c: {
  favored: number;
  allowed: number;
  outlier: number;
  total: number;
}): string {
  const p = (n: number) => (c.total > 0 ? ((100 * n) / c.total).toFixed(1) : '–');
  return `${c.favored} favored (${p(c.favored)} %), ${c.allowed} allowed (${p(c.allowed)} %), ${c.outlier} outliers (${p(c.outlier)} %) of ${c.total}`;
}

/** The readable summary printed without --json. */
export function formatSummary(report: Report, filename: string): string {
  const lines: string[] = [];
  const i = report.input;
  lines.push(
    `${filename}: ${FORMAT_NAME[i.format] ?? i.format}${i.gzip ? ' (gzip)' : ''}, ${count(i.sizeBytes, 'byte')}, sha256 ${i.sha256}`,
  );
  lines.push(
    `engine ${report.engine.version}, ${report.schema}; ${count(report.models.length, 'model')} analysed`,
  );
  if (report.reference)
    lines.push(`reference ${report.reference.id} (sha256 ${report.reference.sha256})`);
  if (report.geometryLibrary)
    lines.push(
      `side-chain geometry ${report.geometryLibrary.id} (sha256 ${report.geometryLibrary.sha256})`,
    );
  for (const m of report.models) {
    const c = m.summary.composition;
    lines.push('');
    lines.push(`Model ${m.model}`);
    lines.push(
      `  ${count(c.chains, 'chain')} (${c.polymerChains} polymer), ${count(c.proteinResidues, 'protein residue')}, ${count(c.nucleicResidues, 'nucleotide')}, ${count(c.waters, 'water')}, ${count(c.ions, 'ion')}, ${count(c.ligands, 'ligand')}`,
    );
    lines.push(`  ${count(c.atoms, 'atom')} (${count(c.hydrogens, 'hydrogen')})`);
    const conformers = m.residues.length;
    const alt = m.residues.filter((r) => r.altloc !== '').length;
    lines.push(`  ${count(conformers, 'residue row')} (${count(alt, 'alternate conformer row')})`);
    lines.push(
      `  torsions defined: phi ${definedCount(m, 'phi')}, psi ${definedCount(m, 'psi')}, omega ${definedCount(m, 'omega')}`,
    );
    const breaks = m.residues.filter((r) => r.flags.includes('chain-break-before')).length;
    const modified = new Map<string, number>();
    for (const r of m.residues)
      if (r.flags.includes('modified'))
        modified.set(`${r.name}→${r.parent}`, (modified.get(`${r.name}→${r.parent}`) ?? 0) + 1);
    lines.push(`  chain breaks: ${breaks}`);
    if (modified.size > 0) {
      lines.push(`  modified residues: ${[...modified].map(([k, v]) => `${k} ×${v}`).join(', ')}`);
    }
    const missing = m.residues.filter((r) => r.flags.includes('missing-atoms')).length;
    if (missing > 0) lines.push(`  residues with missing atoms: ${missing}`);
    const s = m.summary;
    if (s.bonds.count > 0)
      lines.push(
        `  bonds: ${s.bonds.count}, RMS-Z ${s.bonds.rmsZ?.toFixed(3) ?? '–'}, ${s.bonds.outliers} beyond 4σ`,
      );
    if (s.angles.count > 0)
      lines.push(
        `  angles: ${s.angles.count}, RMS-Z ${s.angles.rmsZ?.toFixed(3) ?? '–'}, ${s.angles.outliers} beyond 4σ`,
      );
    if (s.rama) {
      const o = s.rama.overall;
      lines.push(`  Ramachandran: ${verdictCounts(o)}`);
    }
    if (s.rama) {
      for (const [cls, c] of Object.entries(s.rama.byClass))
        lines.push(`    ${cls}: ${verdictCounts(c)}`);
      const steric: Record<string, number> = {};
      for (const r of m.residues) if (r.steric) steric[r.steric] = (steric[r.steric] ?? 0) + 1;
      lines.push(
        `  hard-sphere steric map: ${steric['full'] ?? 0} fully allowed, ${steric['outer-limit'] ?? 0} outer limit, ${steric['disallowed'] ?? 0} disallowed`,
      );
    }
    if (s.rotamers) lines.push(`  rotamers: ${verdictCounts(s.rotamers)}`);
    if (s.overlaps)
      lines.push(
        `  all-atom overlaps: ${s.overlaps.severe} severe (≥ 0.4 Å), ${s.overlaps.perThousandAtoms} per 1000 atoms; hydrogens ${s.overlaps.hydrogens}, ${s.overlaps.xhConvention} X–H lengths`,
      );
    for (const n of s.notComputed) lines.push(`  not computed (${n.statistic}): ${n.reason}`);
  }
  for (const c of report.cautions) lines.push(`caution: ${c}`);
  return lines.join('\n') + '\n';
}

interface ParsedArgs {
  file: string;
  json: boolean;
  model?: number;
  geometryOnly: boolean;
}

function parseArgs(args: string[]): ParsedArgs | string {
  let file: string | undefined;
  let json = false;
  let model: number | undefined;
  let geometryOnly = false;
  for (let i = 0; i < args.length; i++) {
    const a = args[i];
    if (a === '--json') json = true;
    else if (a === '--geometry-only') geometryOnly = true;
    else if (a === '--model') {
      const v = args[++i];
      if (v === undefined || !/^-?\d+$/.test(v))
        return `--model needs a model number, e.g. --model 1. ${REPORT_USAGE}`;
      model = Number(v);
    } else if (a.startsWith('--model=')) {
      const v = a.slice(8);
      if (!/^-?\d+$/.test(v))
        return `--model needs a model number, e.g. --model=1. ${REPORT_USAGE}`;
      model = Number(v);
    } else if (a.startsWith('-')) return `unknown option ${a}. ${REPORT_USAGE}`;
    else if (file === undefined) file = a;
    else return `only one file can be reported at a time (got ${file} and ${a}). ${REPORT_USAGE}`;
  }
  if (file === undefined) return `no file given. ${REPORT_USAGE}`;
  return { file, json, model, geometryOnly };
}

/** Run the command; returns the exit code. */
export async function runReportCommand(args: string[], io: CommandIo): Promise<number> {
  const parsed = parseArgs(args);
  if (typeof parsed === 'string') {
    io.err(`foldfolio report: ${parsed}\n`);
    return 2;
  }
  let bytes: Uint8Array;
  try {
    if (!statSync(parsed.file).isFile()) throw new Error('not a file');
    bytes = readFileSync(parsed.file);
  } catch {
    io.err(
      `foldfolio report: cannot read ${parsed.file}: check the path and that it is a readable file.\n`,
    );
    return 2;
  }
  try {
    const report = await buildReport(bytes, {
      filename: basename(parsed.file),
      model: parsed.model,
      scope: parsed.geometryOnly ? 'geometry' : 'full',
      gunzip: nodeGunzip,
      sha256: nodeSha256,
    });
    io.out(
      parsed.json ? JSON.stringify(report) + '\n' : formatSummary(report, basename(parsed.file)),
    );
    return 0;
  } catch (e) {
    if (e instanceof StructureReadError) {
      io.err(`foldfolio report: ${basename(parsed.file)}: ${e.message.replace(/\s+/g, ' ')}\n`);
      return 2;
    }
    throw e;
  }
}
