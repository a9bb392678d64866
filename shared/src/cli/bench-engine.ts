/**
 * Engine benchmark (readers + backbone torsions + full report), run by `npm run bench`
 * (scripts/bench.sh). Node edge: reads files, spawns gemmi and a child process for peak RSS.
 *
 *   node shared/dist/cli/bench-engine.js [--reference-set DIR] [--atoms 1000000] [--skip-reference-set]
 *
 * 1. The reference set (1,100 PDB files): read + phi/psi/omega, ours vs gemmi in the same run.
 * 2. A 1,000,000-atom model tiled from real chains (written once as mmCIF to a temp folder):
 *    read + phi/psi/omega, ours vs gemmi; then the geometry report (issue 3's bar) and, for
 *    information, the full report in child processes (time, peak RSS), and both again against a
 *    100,000-atom model (linearity).
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { readStructure } from '../io/read';
import { buildConformers } from '../model/conformers';
import { computeBackboneTorsions } from '../validation/torsions';
import { nodeGunzip } from './node-gunzip';
import { tiledCif } from '../model/tile';
import { BatchWorker, serveBatches } from './bench-worker';

const ROOT = resolve(__dirname, '../../..');
const GEMMI_SCRIPT = join(ROOT, 'scripts/bench/gemmi_torsions.py');
const CHILD = join(__dirname, 'bench-report-child.js');
const PY = '/usr/bin/python3';

// Bars from issue 3 (performance bars of `npm run bench`).
const BAR_RATIO = 1.0;
const AIM_RATIO = 0.5;
const BAR_REPORT_S = 10;
const BAR_RSS_MB = 2.5 * 1024;
const BAR_LINEAR = 1 / 8;

interface GemmiResult {
  seconds: number;
  cpu: number;
  files: number;
  residues: number;
  phiDefined: number;
}

function gemmi(files: string[], dir: string): GemmiResult {
  const list = join(dir, 'files.txt');
  writeFileSync(list, files.join('\n'));
  return JSON.parse(
    execFileSync(PY, [GEMMI_SCRIPT, '@' + list], { encoding: 'utf8', maxBuffer: 1 << 20 }),
  ) as GemmiResult;
}

/** Read + phi/psi/omega of every model of every file; returns seconds and torsion counts. */
async function ours(
  files: string[],
): Promise<{ seconds: number; cpu: number; residues: number; phiDefined: number }> {
  const t0 = performance.now();
  const c0 = process.cpuUsage();
  let residues = 0;
  let phiDefined = 0;
  for (const f of files) {
    const s = await readStructure(readFileSync(f), f, { gunzip: nodeGunzip });
    for (const m of s.models) {
      const t = buildConformers(s, m);
      const tor = computeBackboneTorsions(m, t);
      residues += m.residues.count;
      for (let k = 0; k < t.count; k++) if (!Number.isNaN(tor.phi[k])) phiDefined++;
    }
  }
  const c = process.cpuUsage(c0);
  return {
    seconds: (performance.now() - t0) / 1000,
    cpu: (c.user + c.system) / 1e6,
    residues,
    phiDefined,
  };
}

type OursResult = Awaited<ReturnType<typeof ours>>;

function fmt(s: number): string {
  return s.toFixed(2) + ' s';
}

function verdict(ok: boolean): string {
  return ok ? 'PASS' : 'FAIL';
}

interface ChildResult {
  seconds: number;
  cpuSeconds: number;
  maxRssMB: number;
  rows: number;
  timings: Record<string, number>;
}

function stepLine(c: ChildResult): string {
  return Object.entries(c.timings)
    .sort((x, y) => y[1] - x[1])
    .map(([k, v]) => `${k} ${(v / 1000).toFixed(2)} s`)
    .join(', ');
}

function child(
  file: string,
  warmUp: string,
  runs = 1,
  v8Flags: string[] = [],
  scope: 'full' | 'geometry' = 'full',
): ChildResult {
  const out = execFileSync(
    process.execPath,
    ['--max-old-space-size=4096', ...v8Flags, CHILD, file, warmUp, String(runs), scope],
    { encoding: 'utf8', maxBuffer: 1 << 20 },
  );
  return JSON.parse(out) as ChildResult;
}

async function main(): Promise<void> {
  const args = process.argv.slice(2);
  const opt = (name: string, dflt: string): string => {
    const i = args.indexOf(name);
    return i >= 0 && args[i + 1] !== undefined ? args[i + 1] : dflt;
  };
  const refDir = resolve(opt('--reference-set', join(ROOT, '../shared/data/reference-set')));
  const bigAtoms = Number(opt('--atoms', '1000000'));
  const work = mkdtempSync(join(tmpdir(), 'foldfolio-bench-'));
  let failures = 0;
  // our side in a worker that starts no processes (see bench-worker.ts)
  const worker = new BatchWorker<OursResult>(__filename, ['--ours-worker']);
  try {
    // 1. reference set (--skip-reference-set: only the tiled models)
    const skipRef = args.includes('--skip-reference-set');
    const files = readdirSync(refDir)
      .filter((f) => /\.(pdb|ent|cif|bcif)(\.gz)?$/i.test(f))
      .sort()
      .map((f) => join(refDir, f))
      .slice(0, skipRef ? 0 : undefined);
    if (!skipRef) console.log(`reference set: ${files.length} files in ${refDir}`);
    if (!skipRef) {
      // warm-up, not timed: one pass over the whole set, so the optimising compiler has seen
      // every reader path (mmCIF, PDB, BinaryCIF, gzip) as a long-running worker has; with 20
      // files the timed pass still paid for compilation (2.6-3.9 s CPU instead of 1.8-2.7 s)
      await worker.run(files);
      // Interleave ours and gemmi over 10 batches so both see the same machine load (other
      // processes on a shared 2-core machine swing single-run timings by 2-3×).
      const a = { seconds: 0, cpu: 0, residues: 0, phiDefined: 0 };
      const g = { seconds: 0, cpu: 0, files: 0, residues: 0, phiDefined: 0 };
      const batch = Math.ceil(files.length / 10);
      for (let i = 0; i < files.length; i += batch) {
        const part = files.slice(i, i + batch);
        const x = await worker.run(part);
        const y = gemmi(part, work);
        a.seconds += x.seconds;
        a.cpu += x.cpu;
        a.residues += x.residues;
        a.phiDefined += x.phiDefined;
        g.seconds += y.seconds;
        g.cpu += y.cpu;
        g.files += y.files;
        g.residues += y.residues;
        g.phiDefined += y.phiDefined;
      }
      // the bar is judged on CPU time (process CPU, ours and gemmi's): wall time on a machine
      // shared with other jobs swings 2-3×; wall times are printed too
      const ratio = a.cpu / g.cpu;
      console.log(
        `  read + phi/psi/omega   CPU foldfolio ${fmt(a.cpu)}   gemmi ${fmt(g.cpu)}   ratio ${ratio.toFixed(2)}×   (bar ≤ ${BAR_RATIO}×, aim ≤ ${AIM_RATIO}×) ${verdict(ratio <= BAR_RATIO)}   [wall ${fmt(a.seconds)} vs ${fmt(g.seconds)}]`,
      );
      console.log(
        `  residues ${a.residues} (gemmi ${g.residues}); phi defined ${a.phiDefined} (gemmi, no break test: ${g.phiDefined})`,
      );
      if (ratio > BAR_RATIO) failures++;
    }

    // 2. tiled models
    const srcPath = join(ROOT, 'shared/test/fixtures/2XHE.cif');
    const src = await readStructure(readFileSync(srcPath), srcPath);
    const big = tiledCif(src, bigAtoms);
    const bigFile = join(work, `tiled-${big.atoms}.cif`);
    writeFileSync(bigFile, big.text);
    const small = tiledCif(src, Math.round(bigAtoms / 10));
    const smallFile = join(work, `tiled-${small.atoms}.cif`);
    writeFileSync(smallFile, small.text);
    console.log(
      `tiled model: ${big.atoms} atoms (protein chains of 2XHE, copies 150 Å apart), ${(big.text.length / 1e6).toFixed(0)} MB mmCIF`,
    );
    await worker.run([smallFile]); // warm-up (JIT) on the small model, not timed
    const b = await worker.run([bigFile]);
    const gb = gemmi([bigFile], work);
    const rb = b.cpu / gb.cpu;
    console.log(
      `  read + phi/psi/omega   CPU foldfolio ${fmt(b.cpu)}   gemmi ${fmt(gb.cpu)}   ratio ${rb.toFixed(2)}×   (bar ≤ ${BAR_RATIO}×) ${verdict(rb <= BAR_RATIO)}   [wall ${fmt(b.seconds)} vs ${fmt(gb.seconds)}]`,
    );
    if (rb > BAR_RATIO) failures++;
    // Issue 3's bar is the geometry report (readers, torsions, covalent geometry, peptides,
    // chirality and Cβ, secondary structure, composition): the verdicts and all-atom overlaps of
    // engine II have their own bar, "full report, overlaps included, < 20 s" (verdicts section).
    // Judged on wall time, as the bar is stated; CPU time is printed to show machine load.
    const geo = child(bigFile, srcPath, 1, [], 'geometry');
    const okTime = geo.seconds < BAR_REPORT_S;
    const okRss = geo.maxRssMB < BAR_RSS_MB;
    console.log(
      `  geometry report        ${fmt(geo.seconds)} wall, ${fmt(geo.cpuSeconds)} CPU (bar < ${BAR_REPORT_S} s) ${verdict(okTime)}   peak RSS ${geo.maxRssMB.toFixed(0)} MB (bar < ${BAR_RSS_MB} MB) ${verdict(okRss)}   ${geo.rows} residue rows`,
    );
    console.log(`    steps: ${stepLine(geo)}`);
    const full = child(bigFile, srcPath);
    console.log(
      `  full report (info; verdicts + overlaps too, bar in the verdicts section)   ${fmt(full.seconds)} wall, ${fmt(full.cpuSeconds)} CPU, peak RSS ${full.maxRssMB.toFixed(0)} MB`,
    );
    console.log(`    steps: ${stepLine(full)}`);
    // Linearity: the work of the engine, not the machine's. V8 runs its garbage collector and
    // optimising compiler on helper threads whose CPU time is not proportional to the model
    // (a 100,000-atom report spent ~0.5 s of extra CPU on them here); --single-threaded keeps
    // that work on the measured thread. Both sizes: warmed up on the 100,000-atom model, best of
    // five runs, each after a full collection of the previous run's garbage (the same protocol
    // for both; single runs of the same code here differ by up to 25 %). Judged on the geometry
    // report; the full report's ratio is printed too.
    const st = ['--single-threaded', '--expose-gc'];
    let frac = 0;
    for (const scope of ['geometry', 'full'] as const) {
      const part = child(smallFile, smallFile, 5, st, scope);
      const whole = child(bigFile, smallFile, 5, st, scope);
      const f = part.cpuSeconds / whole.cpuSeconds;
      if (scope === 'geometry') frac = f;
      console.log(
        `  linear growth, ${scope} report (single-threaded V8, best of 5): ${small.atoms} atoms ${fmt(part.cpuSeconds)} CPU, ${big.atoms} atoms ${fmt(whole.cpuSeconds)} CPU = ${f.toFixed(3)} ${scope === 'geometry' ? `(bar ≤ ${BAR_LINEAR.toFixed(3)}) ${verdict(f <= BAR_LINEAR)}` : '(info)'}`,
      );
    }
    if (!okTime) failures++;
    if (!okRss) failures++;
    if (frac > BAR_LINEAR) failures++;
  } finally {
    worker.stop();
    rmSync(work, { recursive: true, force: true });
  }
  console.log(`engine bench: ${failures === 0 ? 'all bars met' : `${failures} bar(s) missed`}`);
}

if (process.argv[2] === '--ours-worker') serveBatches(ours);
else
  main().catch((e: unknown) => {
    console.error(`engine bench failed: ${e instanceof Error ? e.stack : String(e)}`);
    process.exitCode = 1;
  });
