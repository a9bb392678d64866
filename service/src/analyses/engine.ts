import * as shared from '@foldfolio/shared';
import type { AnalysisStage, Report } from '@foldfolio/shared';
// Node's native zlib and SHA-256 at the service edge (the engine's pure-TS fallbacks serve the
// browser): same bytes out, a fraction of the CPU time.
import { nodeGunzip } from '@foldfolio/shared/dist/cli/node-gunzip.js';
import { nodeSha256 } from '@foldfolio/shared/dist/cli/node-sha256.js';

export interface EngineRunOptions {
  filename: string;
  sha256: string;
  /** called as the engine moves through its stages; fraction is 0–1 within the stage */
  onStage: (stage: AnalysisStage, fraction: number) => void;
}

/**
 * Runs the engine exactly as `buildReport` does (read, analyse, add the file's experimental
 * records), split so the stages can be reported: parse, geometry (every per-residue analysis),
 * overlaps (the all-atom contact step), then the caller stores the result.
 */
export async function runEngine(bytes: Uint8Array, opts: EngineRunOptions): Promise<Report> {
  opts.onStage('parse', 0);
  // a gzip bomb stops at this ceiling (default: the engine's own, 2 GiB)
  const limit = Number(
    process.env.FOLDFOLIO_MAX_UNCOMPRESSED_BYTES ?? shared.DEFAULT_MAX_UNCOMPRESSED_BYTES,
  );
  const readOptions = { maxUncompressedBytes: limit, gunzip: nodeGunzip };
  const structure = await shared.readStructure(bytes, opts.filename, readOptions);
  opts.onStage('geometry', 0);
  const report = shared.buildReportFromStructure(structure, bytes, {
    sha256: nodeSha256,
    // the all-atom overlap step is the long one: report it as its own stage
    onStep: (step, i, n) =>
      opts.onStage(
        step === 'overlapStep' ? 'overlaps' : 'geometry',
        (i + (step === 'overlapStep' ? 0.5 : 0)) / n,
      ),
  });
  await shared.completeReport(report, bytes, opts.filename, readOptions);
  return report;
}
