import { Tab, Tabs } from '@blueprintjs/core';
import { Outlet, useLocation, useNavigate } from 'react-router';
import { useDocumentTitle } from '../../hooks/useDocumentTitle';

export function AdminLayout() {
  useDocumentTitle('Admin');
  const location = useLocation();
  const navigate = useNavigate();
  const section = location.pathname.startsWith('/admin/outbox') ? 'outbox' : 'users';
  return (
    <div className="ff-page">
      <header className="ff-page-header">
        <div>
          <h1>Admin</h1>
          <p className="ff-muted">Accounts on this installation and the mail it has sent.</p>
        </div>
      </header>
      <Tabs
        id="admin-tabs"
        selectedTabId={section}
        onChange={(next) => navigate(`/admin/${String(next)}`)}
        size="large"
        className="ff-tabs"
      >
        <Tab id="users" title="Users" icon="people" />
        <Tab id="outbox" title="Outbox" icon="envelope" />
      </Tabs>
      <section className="ff-tab-panel">
        <Outlet />
      </section>
    </div>
  );
}
