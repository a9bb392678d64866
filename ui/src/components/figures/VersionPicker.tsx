import { HTMLSelect, NonIdealState } from '@blueprintjs/core';
import type { ModelVersionDto } from '@foldfolio/shared';
import { useSearchParams } from 'react-router';
import { useModelVersions } from '../../api/workflow';
import { Loading } from '../Loading';
import { Problem } from '../Problem';

/** The analysed version the tab shows (?version=…, default the newest analysed one). */
export function useChosenVersion(manuscriptId: string) {
  const versions = useModelVersions(manuscriptId);
  const [params, setParams] = useSearchParams();
  const done = (versions.data ?? []).filter((v) => v.analysis?.status === 'done');
  const wanted = params.get('version');
  const chosen: ModelVersionDto | null = done.find((v) => v.id === wanted) ?? done[0] ?? null;
  const gate = versions.isPending ? (
    <Loading label="Loading versions…" />
  ) : versions.isError ? (
    <Problem error={versions.error} />
  ) : !chosen ? (
    <NonIdealState
      icon="cube"
      title="No analysed model yet"
      description="Upload a model in the Models tab; once its analysis finishes, its figures and methods table appear here."
    />
  ) : null;
  const picker = (
    <label className="ff-inline-label">
      Model version{' '}
      <HTMLSelect
        value={chosen?.id ?? ''}
        onChange={(e) => {
          const next = new URLSearchParams(params);
          next.set('version', e.target.value);
          setParams(next, { replace: true });
        }}
        aria-label="Model version"
      >
        {done.map((v) => (
          <option key={v.id} value={v.id}>
            v{v.n} · {v.filename}
          </option>
        ))}
      </HTMLSelect>
    </label>
  );
  return { chosen, gate, picker };
}
