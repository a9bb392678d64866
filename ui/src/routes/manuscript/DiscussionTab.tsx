import { useState } from 'react';
import { Callout, HTMLSelect, InputGroup, NonIdealState } from '@blueprintjs/core';
import type { CommentAnchor, CommentAnchorType, ManuscriptDto } from '@foldfolio/shared';
import { useComments, useModelVersions } from '../../api/workflow';
import { Loading } from '../../components/Loading';
import { Problem } from '../../components/Problem';
import { Composer, Thread, anchorLabel } from '../../components/workflow/Comments';
import '../../styles/workflow.css';

/** Where a new thread is anchored: a version, a figure or a table cell (residues: Quality tab). */
function NewThread({ manuscript }: { manuscript: ManuscriptDto }) {
  const versions = useModelVersions(manuscript.id);
  const [type, setType] = useState<CommentAnchorType>('version');
  const [versionId, setVersionId] = useState('');
  const [figureId, setFigureId] = useState('');
  const [tableId, setTableId] = useState('methods');
  const [row, setRow] = useState('');
  const [column, setColumn] = useState('');
  const vid = versionId || versions.data?.[0]?.id || '';
  const anchor: CommentAnchor | null =
    type === 'version'
      ? vid
        ? { type, modelVersionId: vid }
        : null
      : type === 'figure'
        ? figureId.trim()
          ? { type, figureId: figureId.trim() }
          : null
        : tableId.trim() && row.trim() && column.trim()
          ? { type: 'table-cell', tableId: tableId.trim(), row: row.trim(), column: column.trim() }
          : null;
  return (
    <section className="ff-dropzone" aria-label="Start a thread">
      <div className="ff-toolbar">
        <label>
          About{' '}
          <HTMLSelect
            value={type}
            onChange={(e) => setType(e.target.value as CommentAnchorType)}
            aria-label="Anchor"
          >
            <option value="version">a model version</option>
            <option value="figure">a figure</option>
            <option value="table-cell">a table cell</option>
          </HTMLSelect>
        </label>
        {type === 'version' && (
          <HTMLSelect
            value={vid}
            onChange={(e) => setVersionId(e.target.value)}
            aria-label="Version"
          >
            {(versions.data ?? []).map((v) => (
              <option key={v.id} value={v.id}>
                version {v.n} · {v.filename}
              </option>
            ))}
          </HTMLSelect>
        )}
        {type === 'figure' && (
          <InputGroup
            placeholder="Figure name, e.g. rama-1"
            value={figureId}
            onChange={(e) => setFigureId(e.target.value)}
          />
        )}
        {type === 'table-cell' && (
          <>
            <InputGroup
              placeholder="Table"
              value={tableId}
              onChange={(e) => setTableId(e.target.value)}
            />
            <InputGroup
              placeholder="Row, e.g. R-free"
              value={row}
              onChange={(e) => setRow(e.target.value)}
            />
            <InputGroup
              placeholder="Column"
              value={column}
              onChange={(e) => setColumn(e.target.value)}
            />
          </>
        )}
      </div>
      {type === 'version' && !vid ? (
        <p className="ff-muted">Upload a model first to comment on it.</p>
      ) : anchor ? (
        <Composer manuscriptId={manuscript.id} anchor={anchor} />
      ) : (
        <p className="ff-muted">Say what the comment is about first.</p>
      )}
      <p className="ff-muted">
        Comments on single residues start from the Quality tab’s residue table.
      </p>
    </section>
  );
}

export function DiscussionTab({ manuscript }: { manuscript: ManuscriptDto }) {
  const canDiscuss = manuscript.role !== 'reviewer';
  const [status, setStatus] = useState('open');
  const versions = useModelVersions(manuscript.id);
  const threads = useComments(manuscript.id, { status }, canDiscuss);
  if (!canDiscuss)
    return (
      <Callout icon="eye-off" title="The discussion is for the team">
        Reviewers see the manuscript, its models and review packages, but not the authors’ comments.
      </Callout>
    );
  const versionN = (id: string) => versions.data?.find((v) => v.id === id)?.n;
  return (
    <div className="ff-discussion-tab">
      {manuscript.status !== 'archived' && <NewThread manuscript={manuscript} />}
      <div className="ff-toolbar">
        <label>
          Show{' '}
          <HTMLSelect
            value={status}
            onChange={(e) => setStatus(e.target.value)}
            aria-label="Thread status"
          >
            <option value="open">open threads</option>
            <option value="resolved">resolved threads</option>
            <option value="all">all threads</option>
          </HTMLSelect>
        </label>
      </div>
      {threads.isPending && <Loading label="Loading the discussion…" />}
      {threads.isError && <Problem error={threads.error} />}
      {threads.data?.length === 0 && (
        <NonIdealState
          icon="chat"
          title="No threads here"
          description="Start one above, or on a residue in the Quality tab."
        />
      )}
      {threads.data?.map((t) => (
        <Thread
          key={t.id}
          manuscriptId={manuscript.id}
          thread={t}
          label={anchorLabel(t.anchor, versionN)}
        />
      ))}
    </div>
  );
}
