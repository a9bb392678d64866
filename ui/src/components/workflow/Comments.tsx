import { useState } from 'react';
import { Button, ButtonGroup, Tag, TextArea } from '@blueprintjs/core';
import type { CommentAnchor, CommentDto, CommentThreadDto } from '@foldfolio/shared';
import { errorMessage } from '../../api/client';
import { useCreateComment, useReply, useSetResolved } from '../../api/workflow';
import { formatDateTime } from '../../hooks/format';
import { notify } from '../toaster';

function CommentView({ c }: { c: CommentDto }) {
  return (
    <div className="ff-comment">
      <div className="ff-comment-meta ff-muted">
        <strong>{c.author?.displayName ?? 'a former member'}</strong> ·{' '}
        {formatDateTime(c.createdAt)}
        {c.mentions.length > 0 && ` · mentions ${c.mentions.join(', ')}`}
      </div>
      {/* bodyHtml is rendered from Markdown and sanitised by the service (comments/markdown.ts) */}
      <div className="ff-comment-body" dangerouslySetInnerHTML={{ __html: c.bodyHtml }} />
    </div>
  );
}

export function anchorLabel(
  a: CommentAnchor,
  versionN?: (id: string) => number | undefined,
): string {
  const v = a.modelVersionId ? versionN?.(a.modelVersionId) : undefined;
  const vs = v ? `version ${v}` : 'a version';
  switch (a.type) {
    case 'version':
      return vs;
    case 'residue':
      return `${a.chain} ${a.seq}${a.icode ?? ''} in ${vs}`;
    case 'figure':
      return `figure ${a.figureId}`;
    default:
      return `table ${a.tableId}, ${a.row} / ${a.column}`;
  }
}

export function Thread({
  manuscriptId,
  thread,
  label,
}: {
  manuscriptId: string;
  thread: CommentThreadDto;
  label?: string;
}) {
  const reply = useReply(manuscriptId);
  const setResolved = useSetResolved(manuscriptId);
  const [text, setText] = useState('');
  const [open, setOpen] = useState(false);
  const resolved = thread.resolvedAt !== null;
  return (
    <div className={`ff-thread${resolved ? ' ff-resolved' : ''}`} data-testid="comment-thread">
      {label && (
        <Tag minimal icon="pin">
          {label}
        </Tag>
      )}{' '}
      {resolved && (
        <Tag minimal intent="success" icon="tick">
          resolved
        </Tag>
      )}
      <CommentView c={thread} />
      {thread.replies.map((r) => (
        <div key={r.id} style={{ marginLeft: 18 }}>
          <CommentView c={r} />
        </div>
      ))}
      {open && (
        <div style={{ marginLeft: 18 }}>
          <TextArea
            fill
            value={text}
            placeholder="Reply (Markdown; @name mentions a member)"
            onChange={(e) => setText(e.target.value)}
          />
        </div>
      )}
      <ButtonGroup minimal>
        {open ? (
          <Button
            icon="send-message"
            text="Send reply"
            disabled={!text.trim()}
            loading={reply.isPending}
            onClick={() =>
              reply.mutate(
                { id: thread.id, body: text },
                {
                  onSuccess: () => {
                    setText('');
                    setOpen(false);
                  },
                  onError: (e) => notify(errorMessage(e), 'danger'),
                },
              )
            }
          />
        ) : (
          <Button icon="comment" text="Reply" onClick={() => setOpen(true)} />
        )}
        <Button
          icon={resolved ? 'refresh' : 'tick'}
          text={resolved ? 'Reopen' : 'Resolve'}
          loading={setResolved.isPending}
          onClick={() =>
            setResolved.mutate(
              { id: thread.id, resolved: !resolved },
              { onError: (e) => notify(errorMessage(e), 'danger') },
            )
          }
        />
      </ButtonGroup>
    </div>
  );
}

/** A new thread on `anchor`. */
export function Composer({
  manuscriptId,
  anchor,
  placeholder,
}: {
  manuscriptId: string;
  anchor: CommentAnchor;
  placeholder?: string;
}) {
  const create = useCreateComment(manuscriptId);
  const [text, setText] = useState('');
  return (
    <div className="ff-composer">
      <TextArea
        fill
        value={text}
        aria-label="New comment"
        placeholder={placeholder ?? 'Comment (Markdown; @name mentions a member)'}
        onChange={(e) => setText(e.target.value)}
      />
      <Button
        intent="primary"
        icon="send-message"
        text="Comment"
        disabled={!text.trim()}
        loading={create.isPending}
        onClick={() =>
          create.mutate(
            { anchor, body: text },
            {
              onSuccess: () => {
                setText('');
                notify('Comment posted.');
              },
              onError: (e) => notify(errorMessage(e), 'danger'),
            },
          )
        }
        style={{ marginTop: 6 }}
      />
    </div>
  );
}
