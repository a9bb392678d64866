import {
  Button,
  Callout,
  EditableText,
  NonIdealState,
  Tab,
  Tabs,
  Tag,
  Tooltip,
} from '@blueprintjs/core';
import { Link, Navigate, useNavigate, useParams } from 'react-router';
import { useManuscript, useRenameManuscript, useSetArchived } from '../../api/manuscripts';
import { Loading } from '../../components/Loading';
import { Problem } from '../../components/Problem';
import { notify } from '../../components/toaster';
import { errorMessage } from '../../api/client';
import { formatDateTime, ROLE_LABELS } from '../../hooks/format';
import { useDocumentTitle } from '../../hooks/useDocumentTitle';
import { WORKSPACE_TABS } from './tabs';

export function WorkspacePage() {
  const { id = '', tab = '' } = useParams();
  const navigate = useNavigate();
  const manuscript = useManuscript(id);
  const rename = useRenameManuscript(id);
  const setArchived = useSetArchived(id);
  useDocumentTitle(manuscript.data?.title);

  const current = WORKSPACE_TABS.find((t) => t.id === tab);
  if (!current) return <Navigate to={`/manuscripts/${encodeURIComponent(id)}/models`} replace />;
  if (manuscript.isPending) return <Loading label="Opening the manuscript…" />;
  if (manuscript.isError)
    return (
      <NonIdealState
        icon="document"
        title="This manuscript cannot be opened"
        description={<Problem error={manuscript.error} />}
        action={<Link to="/desk">Back to your Desk</Link>}
      />
    );

  const m = manuscript.data;
  const canEdit = (m.role === 'owner' || m.role === 'editor') && m.status !== 'archived';
  const Current = current.component;

  return (
    <div className="ff-page ff-workspace">
      <nav className="ff-breadcrumb" aria-label="Breadcrumb">
        <Link to="/desk">Desk</Link> <span aria-hidden="true">/</span>
      </nav>
      <header className="ff-page-header">
        <div className="ff-workspace-title">
          <h1>
            {canEdit ? (
              <Tooltip content="Click to rename" placement="bottom-start" minimal>
                <EditableText
                  key={m.title}
                  defaultValue={m.title}
                  maxLength={300}
                  selectAllOnFocus
                  onConfirm={(value) => {
                    const title = value.trim();
                    if (!title || title === m.title) return;
                    rename.mutate(
                      { title },
                      {
                        onSuccess: () => notify('Manuscript renamed.'),
                        onError: (e) => notify(errorMessage(e), 'danger'),
                      },
                    );
                  }}
                />
              </Tooltip>
            ) : (
              m.title
            )}
          </h1>
          <div className="ff-meta">
            <Tag minimal round className="ff-role-tag">
              {ROLE_LABELS[m.role] ?? m.role}
            </Tag>
            <span className="ff-muted ff-num">Started {formatDateTime(m.createdAt)}</span>
            <span className="ff-muted ff-num">
              Last activity {formatDateTime(m.lastActivityAt)}
            </span>
          </div>
        </div>
        {m.role === 'owner' && (
          <Button
            icon={m.status === 'archived' ? 'unarchive' : 'archive'}
            text={m.status === 'archived' ? 'Return to Desk' : 'Archive'}
            loading={setArchived.isPending}
            onClick={() =>
              setArchived.mutate(m.status !== 'archived', {
                onSuccess: () =>
                  notify(
                    m.status === 'archived'
                      ? 'The manuscript is active again.'
                      : 'Manuscript archived.',
                  ),
                onError: (e) => notify(errorMessage(e), 'danger'),
              })
            }
          />
        )}
      </header>
      {m.status === 'archived' && (
        <Callout icon="archive" className="ff-note">
          This manuscript is archived: it stays readable for its members but is hidden from the Desk
          unless “Show archived” is on.
        </Callout>
      )}

      <Tabs
        id="workspace-tabs"
        selectedTabId={current.id}
        onChange={(next) => navigate(`/manuscripts/${encodeURIComponent(id)}/${String(next)}`)}
        size="large"
        className="ff-tabs"
        renderActiveTabPanelOnly
      >
        {WORKSPACE_TABS.map((t) => (
          <Tab key={t.id} id={t.id} title={t.label} icon={t.icon} />
        ))}
      </Tabs>
      <section className="ff-tab-panel" role="tabpanel" aria-label={current.label}>
        <Current manuscript={m} />
      </section>

      <footer className="ff-caution">
        Validation supports expert judgement; it does not replace it, nor the requirements of the
        journal and of the structure archive.
      </footer>
    </div>
  );
}
