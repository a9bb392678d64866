import { useCallback, useMemo, useState } from 'react';
import { Callout, Card, HTMLSelect, NonIdealState } from '@blueprintjs/core';
import type { ManuscriptDto, ModelVersionDto, ResidueFlag } from '@foldfolio/shared';
import { useSearchParams } from 'react-router';
import {
  residueAnchorKey,
  useCommentCounts,
  useModelVersions,
  useReport,
} from '../../api/workflow';
import { Loading } from '../../components/Loading';
import { Problem } from '../../components/Problem';
import { AnalysisProgress } from '../../components/workflow/AnalysisProgress';
import { LedgerPanel } from '../../components/workflow/LedgerPanel';
import { ResiduePanel } from '../../components/workflow/ResiduePanel';
import {
  ResidueTable,
  type SortKey,
  type TableRowData,
  sortRows,
} from '../../components/workflow/ResidueTable';
import {
  OUTLIER_FLAGS,
  cisNonProline,
  outlierCount,
  summaryCards,
} from '../../components/workflow/quality';
import '../../styles/workflow.css';

const ALL_FLAGS: ResidueFlag[] = [
  ...OUTLIER_FLAGS,
  'rama-allowed',
  'cis-peptide',
  'chain-break-before',
  'missing-atoms',
  'modified',
  'ca-only',
];

function VersionReport({
  manuscript,
  version,
}: {
  manuscript: ManuscriptDto;
  version: ModelVersionDto;
}) {
  const report = useReport(manuscript.id, version.id);
  const canDiscuss = manuscript.role !== 'reviewer';
  const counts = useCommentCounts(manuscript.id, version.id, canDiscuss);
  const [filter, setFilter] = useState<string>('all');
  const [sort, setSort] = useState<{ key: SortKey; ascending: boolean }>({
    key: 'outliers',
    ascending: false,
  });
  const [open, setOpen] = useState<TableRowData | null>(null);
  const onSort = useCallback((key: SortKey, ascending: boolean) => setSort({ key, ascending }), []);

  const model = report.data?.models[0];
  const rows = useMemo(() => {
    if (!model) return [];
    const c = counts.data ?? {};
    const all: TableRowData[] = model.residues.map((row) => ({
      row,
      comments: c[residueAnchorKey(version.id, row.chain, row.seq, row.icode)] ?? 0,
    }));
    const kept =
      filter === 'all'
        ? all
        : filter === 'any-outlier'
          ? all.filter((d) => outlierCount(d.row) > 0)
          : filter === 'commented'
            ? all.filter((d) => d.comments > 0)
            : all.filter((d) => d.row.flags.includes(filter as ResidueFlag));
    return sortRows(kept, sort.key, sort.ascending);
  }, [model, counts.data, filter, sort, version.id]);

  if (report.isPending) return <Loading label="Loading the analysis…" />;
  if (report.isError) return <Problem error={report.error} />;
  const s = version.analysis?.summary;
  if (!model || !s) return <Problem error={new Error('This report has no model to show.')} />;
  // statistics that could not be computed have their own panel below
  const worthALook = report.data.cautions.filter((c) => !c.startsWith('Not computed:'));
  const cards = summaryCards(s, cisNonProline(model.residues));

  return (
    <div>
      <Callout icon="info-sign" className="ff-note">
        These statistics are computed by Foldfolio from the uploaded coordinates. Validation
        supports, and does not replace, your expert judgement and the journal’s and the archive’s
        own requirements.
        <div className="ff-muted" data-testid="provenance">
          Computed with Foldfolio engine {report.data.engine.version}
          {report.data.reference ? `; reference ${report.data.reference.id}` : ''}
          {report.data.geometryLibrary
            ? `; side-chain ideal geometry ${report.data.geometryLibrary.id}`
            : ''}
          . Quote these with the numbers.
        </div>
      </Callout>
      <div className="ff-summary-grid" data-testid="summary-cards">
        {cards.map((c) => (
          <Card key={c.id} className="ff-summary-card" data-testid={`card-${c.id}`}>
            <h5 className="bp6-heading">{c.title}</h5>
            <div className="ff-value">{c.value}</div>
            {c.detail && <div className="ff-muted">{c.detail}</div>}
            {c.caution && <div className="ff-caution">{c.caution}</div>}
          </Card>
        ))}
        <Card className="ff-summary-card" data-testid="card-bfactors">
          <h5 className="bp6-heading">B-factors (mean Å²)</h5>
          {model.summary.bFactors.map((g) => (
            <div key={g.group} className="ff-num">
              {g.group}: {g.mean === null ? '—' : g.mean.toFixed(1)} ({g.atoms} atoms)
            </div>
          ))}
        </Card>
      </div>
      {worthALook.length > 0 && (
        <Callout intent="warning" title="Worth a look" icon="warning-sign">
          <ul>
            {worthALook.map((c) => (
              <li key={c}>{c}</li>
            ))}
          </ul>
        </Callout>
      )}
      {model.summary.notComputed.length > 0 && (
        <Callout icon="disable" title="Not computed">
          <ul>
            {model.summary.notComputed.map((n) => (
              <li key={n.statistic}>
                {n.statistic}: {n.reason}
              </li>
            ))}
          </ul>
        </Callout>
      )}
      {version.n > 1 && (
        <details>
          <summary>What changed since version {version.n - 1}</summary>
          <LedgerPanel manuscriptId={manuscript.id} versionId={version.id} />
        </details>
      )}
      <h3 className="bp6-heading">Residues</h3>
      <div className="ff-toolbar">
        <label>
          Show{' '}
          <HTMLSelect
            value={filter}
            onChange={(e) => setFilter(e.target.value)}
            aria-label="Filter residues by flag"
          >
            <option value="all">all residues</option>
            <option value="any-outlier">any outlier</option>
            {canDiscuss && <option value="commented">with comments</option>}
            {ALL_FLAGS.map((f) => (
              <option key={f} value={f}>
                {f}
              </option>
            ))}
          </HTMLSelect>
        </label>
        <label>
          Order{' '}
          <HTMLSelect
            value={`${sort.key}:${sort.ascending ? 'asc' : 'desc'}`}
            aria-label="Order residues"
            onChange={(e) => {
              const [key, dir] = e.target.value.split(':');
              setSort({ key: key as SortKey, ascending: dir === 'asc' });
            }}
          >
            <option value="outliers:desc">outliers first</option>
            <option value="position:desc">chain and number</option>
            <option value="bMean:desc">highest B first</option>
            <option value="bondZMax:desc">worst bond first</option>
            <option value="angleZMax:desc">worst angle first</option>
            <option value="cbDeviationA:desc">largest Cβ deviation first</option>
            {canDiscuss && <option value="comments:desc">most comments first</option>}
          </HTMLSelect>
        </label>
        <span className="ff-muted">
          {rows.length} of {model.residues.length} residue rows · click a row for details and
          comments
        </span>
      </div>
      <ResidueTable rows={rows} onOpen={setOpen} onSort={onSort} />
      <ResiduePanel
        manuscriptId={manuscript.id}
        versionId={version.id}
        row={open?.row ?? null}
        canDiscuss={canDiscuss}
        onClose={() => setOpen(null)}
      />
    </div>
  );
}

export function QualityTab({ manuscript }: { manuscript: ManuscriptDto }) {
  const versions = useModelVersions(manuscript.id);
  const [params, setParams] = useSearchParams();
  if (versions.isPending) return <Loading label="Loading versions…" />;
  if (versions.isError) return <Problem error={versions.error} />;
  if (versions.data.length === 0)
    return (
      <NonIdealState
        icon="pulse"
        title="No model yet"
        description="Upload a model in the Models tab; its statistics appear here."
      />
    );
  const wanted = params.get('version');
  const chosen =
    versions.data.find((v) => v.id === wanted) ??
    versions.data.find((v) => v.analysis?.status === 'done') ??
    versions.data[0];
  return (
    <div className="ff-quality-tab">
      <div className="ff-toolbar">
        <label>
          Version{' '}
          <HTMLSelect
            value={chosen.id}
            aria-label="Version"
            onChange={(e) => setParams({ version: e.target.value }, { replace: true })}
          >
            {versions.data.map((v) => (
              <option key={v.id} value={v.id}>
                {v.n} · {v.filename} · {v.analysis?.status ?? 'not analysed'}
              </option>
            ))}
          </HTMLSelect>
        </label>
      </div>
      {chosen.analysis?.status === 'done' ? (
        <VersionReport key={chosen.id} manuscript={manuscript} version={chosen} />
      ) : (
        <AnalysisProgress analysis={chosen.analysis} />
      )}
    </div>
  );
}
