import { Card, Icon, NonIdealState } from '@blueprintjs/core';
import { Link, NavLink, useParams } from 'react-router';
import { useOutbox, useOutboxMessage } from '../../api/admin';
import { Loading } from '../../components/Loading';
import { Problem } from '../../components/Problem';
import { formatDateTime } from '../../hooks/format';
import { appPathOf } from '../paths';

export function OutboxPage() {
  const { messageId } = useParams();
  const outbox = useOutbox();

  return (
    <div className="ff-outbox">
      <p className="ff-muted">
        Every message Foldfolio sends goes to its local mail sink; nothing leaves this server. Open
        a message to follow its links.
      </p>
      <Problem error={outbox.error} />
      <div className="ff-outbox-panes">
        <div className="ff-outbox-list" data-testid="outbox-list">
          {outbox.isPending ? (
            <Loading />
          ) : (outbox.data ?? []).length === 0 ? (
            <NonIdealState icon="inbox" description="No mail has been sent yet." />
          ) : (
            <ul>
              {[...(outbox.data ?? [])]
                .sort(
                  (a, b) => b.receivedAt.localeCompare(a.receivedAt) || b.id.localeCompare(a.id),
                )
                .map((msg) => (
                  <li key={msg.id}>
                    <NavLink
                      to={`/admin/outbox/${encodeURIComponent(msg.id)}`}
                      className="ff-outbox-item"
                    >
                      <span className="ff-outbox-subject">{msg.subject}</span>
                      <span className="ff-outbox-to">{msg.to}</span>
                      <span className="ff-outbox-date ff-num">
                        {formatDateTime(msg.receivedAt)}
                      </span>
                    </NavLink>
                  </li>
                ))}
            </ul>
          )}
        </div>
        <div className="ff-outbox-message">
          {messageId ? (
            <MessageView id={messageId} />
          ) : (
            <NonIdealState icon="envelope" description="Choose a message on the left." />
          )}
        </div>
      </div>
    </div>
  );
}

function MessageView({ id }: { id: string }) {
  const message = useOutboxMessage(id);
  if (message.isPending) return <Loading />;
  if (message.isError) return <Problem error={message.error} />;
  const m = message.data;
  const origin = window.location.origin;
  return (
    <Card className="ff-message" data-testid="outbox-message">
      <h2>{m.subject}</h2>
      <dl className="ff-facts">
        <dt>To</dt>
        <dd>{m.to}</dd>
        {m.from && (
          <>
            <dt>From</dt>
            <dd>{m.from}</dd>
          </>
        )}
        <dt>Received</dt>
        <dd className="ff-num">{formatDateTime(m.receivedAt)}</dd>
      </dl>
      {m.links.length > 0 && (
        <div className="ff-message-links">
          <h3>Links in this message</h3>
          <ul>
            {m.links.map((href, i) => {
              const path = appPathOf(href, origin);
              return (
                <li key={`${i}-${href}`}>
                  <Icon icon="link" size={12} />{' '}
                  {path ? (
                    <Link to={path}>{href}</Link>
                  ) : (
                    <a href={href} target="_blank" rel="noopener noreferrer">
                      {href}
                    </a>
                  )}
                </li>
              );
            })}
          </ul>
        </div>
      )}
      {/* plain text only: a mail body is never injected as HTML */}
      <pre className="ff-message-text">{m.text}</pre>
    </Card>
  );
}
