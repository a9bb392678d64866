import * as shared from '@foldfolio/shared';
import type { AnalysisStage, Report, Structure } from '@foldfolio/shared';

export interface EngineRunOptions {
  filename: string;
  sha256: string;
  /** called as the engine moves through its stages; fraction is 0–1 within the stage */
  onStage: (stage: AnalysisStage, fraction: number) => void;
}

type FromStructure = (
  structure: Structure,
  bytes: Uint8Array,
  options: Record<string, unknown>,
) => Report;

/**
 * Runs the engine exactly as `buildReport` does (read, then analyse the structure), split in two
 * so the stages can be reported. The analysis half is looked up at run time so the service
 * builds even where the engine's report builder is absent; then the analysis fails with a
 * sentence instead of a crash. The engine gives no finer progress yet: the `geometry` stage
 * covers every per-residue analysis, overlaps included.
 */
export async function runEngine(bytes: Uint8Array, opts: EngineRunOptions): Promise<Report> {
  const fromStructure = (shared as unknown as Record<string, unknown>).buildReportFromStructure;
  if (typeof fromStructure !== 'function') {
    throw new Error(
      'This server’s engine cannot build reports yet (buildReportFromStructure is missing). Ask an admin to update Foldfolio.',
    );
  }
  opts.onStage('parse', 0);
  // a gzip bomb stops at this ceiling (default: the engine's own, 2 GiB)
  const limit = Number(
    process.env.FOLDFOLIO_MAX_UNCOMPRESSED_BYTES ?? shared.DEFAULT_MAX_UNCOMPRESSED_BYTES,
  );
  const structure = await shared.readStructure(bytes, opts.filename, {
    maxUncompressedBytes: limit,
  });
  opts.onStage('geometry', 0);
  return (fromStructure as FromStructure)(structure, bytes, { filename: opts.filename });
}
