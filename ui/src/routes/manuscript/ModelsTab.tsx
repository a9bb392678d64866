import { Card, Callout, NonIdealState, Switch, Tag } from '@blueprintjs/core';
import type { ManuscriptDto, ModelVersionDto } from '@foldfolio/shared';
import { Link } from 'react-router';
import { errorMessage } from '../../api/client';
import { useModelVersions, useNotificationSetting, useSetMuted } from '../../api/workflow';
import { Loading } from '../../components/Loading';
import { Problem } from '../../components/Problem';
import { notify } from '../../components/toaster';
import { AnalysisProgress } from '../../components/workflow/AnalysisProgress';
import { LedgerPanel } from '../../components/workflow/LedgerPanel';
import { UploadPanel } from '../../components/workflow/UploadPanel';
import { formatDateTime } from '../../hooks/format';
import '../../styles/workflow.css';

const FORMAT_LABELS: Record<string, string> = {
  mmcif: 'PDBx/mmCIF',
  bcif: 'BinaryCIF',
  pdb: 'PDB',
};

function size(n: number): string {
  if (n >= 1024 * 1024) return `${(n / 1024 / 1024).toFixed(1)} MB`;
  if (n >= 1024) return `${(n / 1024).toFixed(0)} kB`;
  return `${n} bytes`;
}

function VersionCard({
  v,
  manuscriptId,
  latest,
}: {
  v: ModelVersionDto;
  manuscriptId: string;
  latest: boolean;
}) {
  return (
    <Card className="ff-version" data-testid={`version-${v.n}`}>
      <div className="ff-version-head">
        <h4 className="bp6-heading">Version {v.n}</h4>
        <span className="ff-num">{v.filename}</span>
        <Tag minimal>
          {FORMAT_LABELS[v.format] ?? v.format}
          {v.gzip ? ' · gzip' : ''}
        </Tag>
        <span className="ff-muted ff-num">{size(v.sizeBytes)}</span>
        <span className="ff-muted">
          {v.uploadedBy?.displayName ?? 'a former member'} · {formatDateTime(v.createdAt)}
        </span>
      </div>
      {v.note && <p className="ff-version-note">{v.note}</p>}
      <p className="ff-muted ff-num" title="SHA-256 of the uploaded bytes">
        SHA-256 {v.sha256.slice(0, 16)}…
      </p>
      <AnalysisProgress analysis={v.analysis} />
      {v.analysis?.status === 'done' && (
        <p>
          <Link to={`/manuscripts/${encodeURIComponent(manuscriptId)}/quality?version=${v.id}`}>
            Open in the Quality tab
          </Link>
        </p>
      )}
      {latest && v.n > 1 && v.analysis?.status === 'done' && (
        <details open>
          <summary>What changed since version {v.n - 1}</summary>
          <LedgerPanel manuscriptId={manuscriptId} versionId={v.id} />
        </details>
      )}
    </Card>
  );
}

export function ModelsTab({ manuscript }: { manuscript: ManuscriptDto }) {
  const versions = useModelVersions(manuscript.id);
  const setting = useNotificationSetting(manuscript.id);
  const setMuted = useSetMuted(manuscript.id);
  const canUpload =
    (manuscript.role === 'owner' || manuscript.role === 'editor') &&
    manuscript.status !== 'archived';

  return (
    <div className="ff-models-tab">
      <div className="ff-toolbar">
        <Switch
          checked={!(setting.data?.muted ?? false)}
          disabled={setting.isPending || setMuted.isPending}
          label="E-mail me about new versions, analyses and mentions on this manuscript"
          onChange={(e) =>
            setMuted.mutate(!(e.target as HTMLInputElement).checked, {
              onError: (err) => notify(errorMessage(err), 'danger'),
            })
          }
        />
      </div>
      {canUpload ? (
        <UploadPanel manuscriptId={manuscript.id} />
      ) : (
        <Callout icon="info-sign">
          Owners and editors upload model versions; you can read every version and its analysis.
        </Callout>
      )}
      {versions.isPending && <Loading label="Loading versions…" />}
      {versions.isError && <Problem error={versions.error} />}
      {versions.data && versions.data.length === 0 && (
        <NonIdealState
          icon="cube"
          title="No model yet"
          description="Upload the first refined model to see its validation statistics."
        />
      )}
      <div className="ff-version-list">
        {versions.data?.map((v, i) => (
          <VersionCard key={v.id} v={v} manuscriptId={manuscript.id} latest={i === 0} />
        ))}
      </div>
    </div>
  );
}
