import { Button, Space, Typography } from 'antd';
import { IconWarning } from './icons';

/** A full-width "this page broke" message with the error text and ways out. */
export function ErrorPanel({ error, homeHref = '/' }: { error: unknown; homeHref?: string }) {
  const message = error instanceof Error ? error.message : typeof error === 'string' ? error : 'Unknown error';
  return (
    <div className="state-panel" role="alert">
      <div className="state-panel__icon state-panel__icon--down">
        <IconWarning />
      </div>
      <Typography.Title level={2}>Something went wrong on this page</Typography.Title>
      <Typography.Paragraph type="secondary" className="state-panel__text">
        Kiln hit an error while showing this page, so nothing here can be trusted until you reload. Nothing on
        the server was changed by this error.
      </Typography.Paragraph>
      <pre className="state-panel__detail">{message}</pre>
      <Space>
        <Button type="primary" onClick={() => window.location.reload()}>
          Reload the page
        </Button>
        <Button href={homeHref}>Back to Overview</Button>
      </Space>
    </div>
  );
}
