import { Drawer, DrawerSize, Tag } from '@blueprintjs/core';
import type { ResidueRow } from '@foldfolio/shared';
import { residueAnchorKey, useComments } from '../../api/workflow';
import { Loading } from '../Loading';
import { Problem } from '../Problem';
import { Composer, Thread } from './Comments';
import { OUTLIER_FLAGS } from './quality';

const deg = (v: number | null | undefined) =>
  v === null || v === undefined ? '—' : `${v.toFixed(1)}°`;
const val = (v: number | null | undefined, unit = '', d = 2) =>
  v === null || v === undefined ? '—' : `${v.toFixed(d)}${unit}`;

/** One residue's values and its comment threads, beside the table. */
export function ResiduePanel({
  manuscriptId,
  versionId,
  row,
  canDiscuss,
  onClose,
}: {
  manuscriptId: string;
  versionId: string;
  row: ResidueRow | null;
  canDiscuss: boolean;
  onClose: () => void;
}) {
  const key = row ? residueAnchorKey(versionId, row.chain, row.seq, row.icode) : '';
  const threads = useComments(
    manuscriptId,
    { anchorKey: key, status: 'all' },
    row !== null && canDiscuss,
  );
  return (
    <Drawer
      isOpen={row !== null}
      onClose={onClose}
      size={DrawerSize.SMALL}
      title={
        row
          ? `${row.chain} ${row.name} ${row.seq}${row.icode}${row.altloc ? ` (altloc ${row.altloc})` : ''}`
          : ''
      }
      icon="locate"
    >
      {row && (
        <div className="bp6-drawer-body" style={{ padding: 16 }} data-testid="residue-panel">
          <div className="ff-kv">
            <span>φ / ψ / ω</span>
            <span>
              {deg(row.phi)} / {deg(row.psi)} / {deg(row.omega)}
            </span>
            <span>χ angles</span>
            <span>{row.chi.length ? row.chi.map((c) => deg(c)).join(', ') : '—'}</span>
            <span>Secondary structure</span>
            <span>{row.ss === '-' ? 'none' : row.ss}</span>
            <span>Torsion verdict</span>
            <span>
              {row.rama
                ? `${row.rama.verdict} · ${row.rama.class} · ${row.rama.percentile.toFixed(1)} percentile`
                : '—'}
            </span>
            <span>Rotamer</span>
            <span>
              {row.rotamer
                ? `${row.rotamer.verdict}${row.rotamer.name ? ` · ${row.rotamer.name}` : ''} · ${row.rotamer.percentile.toFixed(1)} percentile`
                : '—'}
            </span>
            <span>Cβ deviation</span>
            <span>{val(row.cbDeviationA, ' Å')}</span>
            <span>Worst bond / angle Z</span>
            <span>
              {val(row.bondZMax, '', 1)} / {val(row.angleZMax, '', 1)}
            </span>
            <span>Mean B</span>
            <span>{val(row.bMean, ' Å²', 1)}</span>
            <span>Lowest occupancy</span>
            <span>{val(row.occupancyMin)}</span>
          </div>
          <p>
            {row.flags.length === 0
              ? 'No flags.'
              : row.flags.map((f) => (
                  <Tag
                    key={f}
                    minimal
                    intent={OUTLIER_FLAGS.includes(f) ? 'danger' : 'none'}
                    style={{ marginRight: 4 }}
                  >
                    {f}
                  </Tag>
                ))}
          </p>
          <h4 className="bp6-heading">Comments</h4>
          {!canDiscuss ? (
            <p className="ff-muted">Reviewers do not see the team’s discussion.</p>
          ) : (
            <>
              {threads.isPending && <Loading label="Loading comments…" />}
              {threads.isError && <Problem error={threads.error} />}
              {threads.data?.length === 0 && (
                <p className="ff-muted">No comments on this residue yet.</p>
              )}
              {threads.data?.map((t) => (
                <Thread key={t.id} manuscriptId={manuscriptId} thread={t} />
              ))}
              <Composer
                manuscriptId={manuscriptId}
                anchor={{
                  type: 'residue',
                  modelVersionId: versionId,
                  chain: row.chain,
                  seq: row.seq,
                  icode: row.icode,
                }}
                placeholder={`Comment on ${row.chain} ${row.seq}${row.icode} (Markdown; @name mentions a member)`}
              />
            </>
          )}
        </div>
      )}
    </Drawer>
  );
}
