import { useMemo, useState } from 'react';
import { Button, Icon, NonIdealState, Switch, Tag } from '@blueprintjs/core';
import { Cell, Column, ColumnHeaderCell, Table2 } from '@blueprintjs/table';
import { Link } from 'react-router';
import { useManuscripts } from '../api/manuscripts';
import { CreateManuscriptDialog } from '../components/CreateManuscriptDialog';
import { Loading } from '../components/Loading';
import { Problem } from '../components/Problem';
import { formatDateTime, ROLE_LABELS } from '../hooks/format';
import { useDocumentTitle } from '../hooks/useDocumentTitle';
import { useElementWidth } from '../hooks/useElementWidth';
import { nextSort, sortManuscripts, type Sort, type SortKey } from './deskSort';

export function DeskPage() {
  useDocumentTitle('Desk');
  const manuscripts = useManuscripts();
  const [creating, setCreating] = useState(false);
  const [showArchived, setShowArchived] = useState(false);
  const [sort, setSort] = useState<Sort>({ key: 'lastActivityAt', dir: -1 });
  const [frameRef, frameWidth] = useElementWidth<HTMLDivElement>(1000);
  // fixed widths for the short columns; the title takes the rest of the frame
  const fixed = [140, 110, 200];
  // (contentRect already excludes the frame's border)
  const titleWidth = Math.max(260, frameWidth - fixed.reduce((a, b) => a + b, 0));

  const rows = useMemo(() => {
    const all = manuscripts.data ?? [];
    return sortManuscripts(showArchived ? all : all.filter((m) => m.status !== 'archived'), sort);
  }, [manuscripts.data, showArchived, sort]);
  const archivedCount = (manuscripts.data ?? []).filter((m) => m.status === 'archived').length;

  const header = (label: string, key: SortKey) => () => (
    <ColumnHeaderCell
      nameRenderer={() => (
        <button
          type="button"
          className="ff-sort-button"
          aria-label={`Sort by ${label}`}
          onClick={() => setSort((s) => nextSort(s, key))}
        >
          {label}
          <Icon
            icon={
              sort.key !== key
                ? 'double-caret-vertical'
                : sort.dir === 1
                  ? 'caret-up'
                  : 'caret-down'
            }
            size={12}
            className={sort.key === key ? 'ff-sort-active' : 'ff-sort-idle'}
          />
        </button>
      )}
    />
  );

  return (
    <div className="ff-page">
      <header className="ff-page-header">
        <div>
          <h1>Desk</h1>
          <p className="ff-muted">The manuscripts you write, edit, comment on or review.</p>
        </div>
        <Button
          intent="primary"
          icon="add"
          text="New manuscript"
          onClick={() => setCreating(true)}
        />
      </header>

      <Problem error={manuscripts.error} />
      {manuscripts.isPending ? (
        <Loading />
      ) : (manuscripts.data ?? []).length === 0 ? (
        <NonIdealState
          icon="manual"
          title="Your Desk is empty"
          description="Start a manuscript for the structure you are writing up, or open an invitation a coauthor sent you."
          action={
            <Button
              intent="primary"
              icon="add"
              text="New manuscript"
              onClick={() => setCreating(true)}
            />
          }
        />
      ) : (
        <>
          <div className="ff-table-tools">
            <span className="ff-muted ff-num">
              {rows.length} manuscript{rows.length === 1 ? '' : 's'}
            </span>
            {archivedCount > 0 && (
              <Switch
                checked={showArchived}
                onChange={(e) => setShowArchived(e.currentTarget.checked)}
                label={`Show archived (${archivedCount})`}
              />
            )}
          </div>
          <div className="ff-table-frame" data-testid="desk-table" ref={frameRef}>
            <Table2
              numRows={rows.length}
              enableRowHeader={false}
              enableColumnResizing={false}
              enableFocusedCell={false}
              selectionModes={[]}
              defaultRowHeight={36}
              columnWidths={[titleWidth, ...fixed]}
              cellRendererDependencies={[rows]}
            >
              <Column
                name="Title"
                columnHeaderCellRenderer={header('Title', 'title')}
                cellRenderer={(i) => (
                  <Cell className="ff-cell" tooltip={rows[i].title}>
                    <Link
                      to={`/manuscripts/${encodeURIComponent(rows[i].id)}/models`}
                      className="ff-title-link"
                    >
                      {rows[i].title}
                    </Link>
                    {rows[i].status === 'archived' && (
                      <Tag minimal className="ff-tag-archived">
                        archived
                      </Tag>
                    )}
                  </Cell>
                )}
              />
              <Column
                name="Your role"
                columnHeaderCellRenderer={header('Your role', 'role')}
                cellRenderer={(i) => (
                  <Cell className="ff-cell">{ROLE_LABELS[rows[i].role] ?? rows[i].role}</Cell>
                )}
              />
              <Column
                name="Members"
                columnHeaderCellRenderer={header('Members', 'memberCount')}
                cellRenderer={(i) => <Cell className="ff-cell ff-num">{rows[i].memberCount}</Cell>}
              />
              <Column
                name="Last activity"
                columnHeaderCellRenderer={header('Last activity', 'lastActivityAt')}
                cellRenderer={(i) => (
                  <Cell className="ff-cell ff-num">{formatDateTime(rows[i].lastActivityAt)}</Cell>
                )}
              />
            </Table2>
          </div>
        </>
      )}
      <CreateManuscriptDialog isOpen={creating} onClose={() => setCreating(false)} />
    </div>
  );
}
