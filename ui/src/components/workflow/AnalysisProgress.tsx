import { Callout, ProgressBar, Tag } from '@blueprintjs/core';
import type { AnalysisDto } from '@foldfolio/shared';

const STAGE_LABELS: Record<string, string> = {
  parse: 'Reading the file',
  geometry: 'Checking geometry and torsions',
  overlaps: 'Looking for overlaps',
  figures: 'Preparing figures',
  store: 'Saving the results',
};

/** The analysis state of one version: a progress bar while it runs, the reason when it failed. */
export function AnalysisProgress({ analysis }: { analysis: AnalysisDto | null }) {
  if (!analysis) return <Tag minimal>not analysed</Tag>;
  if (analysis.status === 'queued')
    return (
      <div className="ff-progress" aria-label="Analysis waiting">
        <span className="ff-muted">Waiting for a worker…</span>
        <ProgressBar value={0} intent="primary" animate stripes />
      </div>
    );
  if (analysis.status === 'running')
    return (
      <div className="ff-progress" aria-label="Analysis running">
        <span className="ff-muted">
          {STAGE_LABELS[analysis.stage ?? ''] ?? 'Analysing'} · {analysis.progress} %
          {analysis.attempts > 1 ? ` · attempt ${analysis.attempts}` : ''}
        </span>
        <ProgressBar value={analysis.progress / 100} intent="primary" />
      </div>
    );
  if (analysis.status === 'failed')
    return (
      <Callout intent="danger" icon="error" title="The analysis failed" role="alert">
        {analysis.error ?? 'No reason was recorded.'}
      </Callout>
    );
  return (
    <Tag intent="success" minimal icon="tick" data-testid="analysis-done">
      analysed
    </Tag>
  );
}
