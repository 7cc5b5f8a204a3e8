import { Collapse, Empty } from 'antd';
import { Fragment, useMemo } from 'react';
import { formatDateTime } from '@/lib/format';
import type { OutboxMessage } from '../api/get-outbox';
import { parseMail } from './mail-message';

/** Text with its web links clickable, as a mail program shows them. */
function Linkified({ text }: { text: string }) {
  const pieces = text.split(/(https?:\/\/[^\s<>"]+)/g);
  return (
    <>
      {pieces.map((piece, i) =>
        /^https?:\/\//.test(piece) ? (
          <a key={i} href={piece} target="_blank" rel="noreferrer">
            {piece}
          </a>
        ) : (
          <Fragment key={i}>{piece}</Fragment>
        ),
      )}
    </>
  );
}

function MessageView({ message }: { message: OutboxMessage }) {
  const mail = useMemo(() => parseMail(message.raw), [message.raw]);
  return (
    <article className="mail-view" data-testid="mail-view">
      <dl className="mail-view__headers">
        <dt>From</dt>
        <dd>{mail.headers.from ?? message.from}</dd>
        <dt>To</dt>
        <dd>{mail.headers.to ?? message.to.join(', ')}</dd>
        <dt>Date</dt>
        <dd>{mail.headers.date ?? formatDateTime(message.receivedAt)}</dd>
        <dt>Subject</dt>
        <dd>{mail.headers.subject ?? message.subject}</dd>
      </dl>
      <pre className="mail-view__body">
        <Linkified text={mail.text} />
      </pre>
    </article>
  );
}

/** Every message the local sink received, newest first; open one to read it as its recipient would. */
export function OutboxList({ messages }: { messages: OutboxMessage[] }) {
  if (messages.length === 0) {
    return <Empty description="No mail yet. Invitations, password resets and notifications appear here as soon as Kiln sends them." />;
  }
  return (
    <Collapse
      className="outbox-list"
      defaultActiveKey={[messages[0]!.id]}
      items={messages.map((m) => ({
        key: m.id,
        label: (
          <span className="outbox-list__label">
            <span className="outbox-list__subject">{m.subject || '(no subject)'}</span>
            <span className="outbox-list__meta">
              to {m.to.join(', ')} · {formatDateTime(m.receivedAt)}
            </span>
          </span>
        ),
        children: <MessageView message={m} />,
      }))}
    />
  );
}
