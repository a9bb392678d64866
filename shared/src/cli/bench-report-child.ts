/**
 * Child process of the engine bench: builds the full report of one file and prints its time
 * and the process's peak RSS as JSON (a fresh process, so the peak belongs to this report).
 *
 *   node bench-report-child.js <file> [<warm-up file> | -] [<runs>] [full | geometry]
 */
import { readFileSync } from 'node:fs';
import { buildReport } from '../report/build';
import { nodeGunzip } from './node-gunzip';
import { nodeSha256 } from './node-sha256';

async function main(): Promise<void> {
  const file = process.argv[2];
  // optional warm-up file: a long-running worker has its code compiled already (JIT), so the
  // timed report should not pay for compilation
  const warm = process.argv[3];
  // runs of the timed report; the fastest is printed (min of repeated runs damps the noise of a
  // shared machine; peak RSS is the whole process's, so it covers every run)
  const runs = Math.max(1, Number(process.argv[4] ?? '1'));
  // report scope: 'geometry' leaves out the verdicts and overlaps (engine I's report)
  const scope = process.argv[5] === 'geometry' ? 'geometry' : 'full';
  if (warm !== undefined && warm !== '-')
    await buildReport(readFileSync(warm), {
      filename: warm,
      gunzip: nodeGunzip,
      sha256: nodeSha256,
      scope,
    });
  let best: {
    seconds: number;
    cpuSeconds: number;
    rows: number;
    timings: Record<string, number>;
  } | null = null;
  // with --expose-gc, each timed run starts from a collected heap (as a worker between jobs),
  // so no run pays for the garbage of the one before
  const gc = (globalThis as { gc?: () => void }).gc;
  for (let run = 0; run < runs; run++) {
    gc?.();
    const t0 = performance.now();
    const c0 = process.cpuUsage();
    const timings: Record<string, number> = {};
    const bytes = readFileSync(file);
    const report = await buildReport(bytes, {
      filename: file,
      gunzip: nodeGunzip,
      sha256: nodeSha256,
      timings,
      scope,
    });
    JSON.stringify(report);
    const seconds = (performance.now() - t0) / 1000;
    const cu = process.cpuUsage(c0);
    const cpuSeconds = (cu.user + cu.system) / 1e6;
    let rows = 0;
    for (const m of report.models) rows += m.residues.length;
    if (best === null || cpuSeconds < best.cpuSeconds)
      best = { seconds, cpuSeconds, rows, timings };
  }
  if (best === null) throw new Error('no run');
  // resourceUsage().maxRSS is in kilobytes (Node docs)
  const maxRssMB = process.resourceUsage().maxRSS / 1024;
  for (const k of Object.keys(best.timings)) best.timings[k] = Math.round(best.timings[k]);
  process.stdout.write(JSON.stringify({ ...best, maxRssMB, runs }));
}

main().catch((e: unknown) => {
  process.stderr.write(`bench child failed: ${e instanceof Error ? e.message : String(e)}\n`);
  process.exitCode = 1;
});
