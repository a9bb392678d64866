import { Callout, HTMLTable, Tag } from '@blueprintjs/core';
import type { AnalysisSummaryDto, LedgerDto, LedgerResidueChange } from '@foldfolio/shared';
import { useLedger } from '../../api/workflow';
import { Loading } from '../Loading';
import { Problem } from '../Problem';
import { SUMMARY_LABELS, formatValue } from './summary';

function residueList(changes: LedgerResidueChange[], which: 'added' | 'removed') {
  if (changes.length === 0) return <span className="ff-muted">none</span>;
  return (
    <ul className="ff-ledger-list">
      {changes.slice(0, 50).map((c) => (
        <li key={`${c.chain}:${c.seq}:${c.icode}`}>
          <span className="ff-num">
            {c.chain} {c.name} {c.seq}
            {c.icode}
          </span>{' '}
          {c[which].map((f) => (
            <Tag
              key={f}
              minimal
              intent={which === 'added' ? 'danger' : 'success'}
              className="ff-flag-tag"
            >
              {f}
            </Tag>
          ))}
        </li>
      ))}
      {changes.length > 50 && <li className="ff-muted">…and {changes.length - 50} more</li>}
    </ul>
  );
}

function LedgerBody({ ledger }: { ledger: LedgerDto }) {
  const changed = ledger.deltas.filter((d) => d.from !== d.to);
  return (
    <div className="ff-ledger" data-testid="ledger">
      <p>
        Version {ledger.to.n} against version {ledger.from.n}:{' '}
        {ledger.caRmsdA === null ? (
          'too few matching Cα atoms to superpose.'
        ) : (
          <>
            Cα RMSD <strong className="ff-num">{ledger.caRmsdA.toFixed(2)} Å</strong> over{' '}
            {ledger.matchedCa} matched residues (Kabsch superposition).
          </>
        )}
        {ledger.residuesOnlyInFrom + ledger.residuesOnlyInTo > 0 &&
          ` ${ledger.residuesOnlyInFrom} residues only in version ${ledger.from.n}, ${ledger.residuesOnlyInTo} only in version ${ledger.to.n}.`}
      </p>
      <div className="ff-summary-grid">
        <div>
          <h5>New outliers ({ledger.newOutliers.length})</h5>
          {residueList(ledger.newOutliers, 'added')}
        </div>
        <div>
          <h5>Fixed outliers ({ledger.fixedOutliers.length})</h5>
          {residueList(ledger.fixedOutliers, 'removed')}
        </div>
      </div>
      {changed.length > 0 && (
        <HTMLTable compact striped className="ff-table">
          <thead>
            <tr>
              <th>Statistic</th>
              <th>v{ledger.from.n}</th>
              <th>v{ledger.to.n}</th>
            </tr>
          </thead>
          <tbody>
            {changed.map((d) => (
              <tr key={d.key}>
                <td>{SUMMARY_LABELS[d.key as keyof AnalysisSummaryDto]}</td>
                <td>{formatValue(d.key, d.from)}</td>
                <td>{formatValue(d.key, d.to)}</td>
              </tr>
            ))}
          </tbody>
        </HTMLTable>
      )}
    </div>
  );
}

/** What changed in `versionId` against `against` (default: the previous version). */
export function LedgerPanel({
  manuscriptId,
  versionId,
  against,
}: {
  manuscriptId: string;
  versionId: string;
  against?: string;
}) {
  const q = useLedger(manuscriptId, versionId, against);
  if (q.isPending) return <Loading label="Comparing versions…" />;
  if (q.isError) return <Problem error={q.error} />;
  if (!q.data.ledger)
    return (
      <Callout icon="info-sign">
        This is the first version: there is nothing to compare it with yet.
      </Callout>
    );
  return <LedgerBody ledger={q.data.ledger} />;
}
