import { createApiTokenSchema, type ApiTokenInfo } from '@kiln/shared';
import { Alert, App, Button, Card, Form, Input, Popconfirm, Skeleton, Table, type TableColumnsType } from 'antd';
import { useState } from 'react';
import { QueryError } from '@/components/query-error';
import { describeError } from '@/lib/describe-error';
import { formatDateTime } from '@/lib/format';
import { useApiTokens, useCreateApiToken, useRevokeApiToken, type CreatedApiToken } from '../api/api-tokens';

/** The secret, shown once, with a copy button and the warning that it will not be shown again. */
function NewTokenNotice({ created, onDone }: { created: CreatedApiToken; onDone: () => void }) {
  const { message } = App.useApp();
  const origin = window.location.origin;
  return (
    <Alert
      type="success"
      showIcon
      className="new-token"
      title={`Token “${created.name}” created. Copy it now: you will not see it again.`}
      description={
        <div className="new-token__body">
          <div className="new-token__secret">
            <code data-testid="new-token-secret">{created.token}</code>
            <Button
              size="small"
              onClick={() =>
                navigator.clipboard
                  .writeText(created.token)
                  .then(() => void message.success('Token copied.'))
                  .catch(() => void message.error('The browser refused to copy; select the token and copy it by hand.'))
              }
            >
              Copy
            </Button>
          </div>
          <div className="new-token__hint">Use it from a script, for example to list your runs:</div>
          <pre className="new-token__snippet">{`curl -H "Authorization: Bearer ${created.token}" \\\n  ${origin}/api/runs?scope=mine`}</pre>
          <Button size="small" onClick={onDone}>
            I have copied it
          </Button>
        </div>
      }
    />
  );
}

/** Personal API tokens: create (secret shown once), list, revoke. */
export function ApiTokensPanel() {
  const tokens = useApiTokens();
  const create = useCreateApiToken();
  const revoke = useRevokeApiToken();
  const [form] = Form.useForm<{ name: string }>();
  const [created, setCreated] = useState<CreatedApiToken | null>(null);
  const { message } = App.useApp();

  const columns: TableColumnsType<ApiTokenInfo> = [
    { title: 'Name', dataIndex: 'name', key: 'name' },
    { title: 'Created', key: 'created', render: (_, t) => formatDateTime(t.createdAt) },
    { title: 'Last used', key: 'used', render: (_, t) => (t.lastUsedAt ? formatDateTime(t.lastUsedAt) : 'never') },
    {
      title: '',
      key: 'actions',
      align: 'right',
      render: (_, t) =>
        t.revokedAt ? (
          <span className="muted">revoked {formatDateTime(t.revokedAt)}</span>
        ) : (
          <Popconfirm
            title={`Revoke “${t.name}”?`}
            description="Scripts using it get 401 at once."
            okText="Revoke"
            okButtonProps={{ danger: true }}
            onConfirm={() =>
              revoke.mutateAsync(t.id).then(() => {
                // A revoked secret is no use to copy any more.
                if (created?.id === t.id) setCreated(null);
                void message.success(`Token “${t.name}” revoked.`);
              })
            }
          >
            <Button size="small" danger aria-label={`Revoke token ${t.name}`}>
              Revoke
            </Button>
          </Popconfirm>
        ),
    },
  ];

  const failure = create.error ? describeError(create.error) : null;
  return (
    <Card
      title="API tokens"
      className="panel"
      size="small"
      extra={
        <a href="/api/docs" target="_blank" rel="noreferrer">
          API reference
        </a>
      }
    >
      <p className="panel__note" style={{ marginTop: 0 }}>
        A token lets a script or notebook act as you, with your role and access, through the same API this page uses. Kiln stores only a hash of it.
      </p>
      {created ? <NewTokenNotice created={created} onDone={() => setCreated(null)} /> : null}
      <Form<{ name: string }>
        form={form}
        layout="inline"
        colon={false}
        requiredMark={false}
        className="token-form"
        onFinish={async ({ name }) => {
          const body = createApiTokenSchema.safeParse({ name });
          if (!body.success) {
            form.setFields([{ name: 'name', errors: [body.error.issues[0]?.message ?? 'invalid'] }]);
            return;
          }
          try {
            setCreated(await create.mutateAsync(body.data.name));
            form.resetFields();
          } catch {
            // Shown below.
          }
        }}
      >
        <Form.Item name="name" label="Token name">
          <Input placeholder="e.g. notebook on my laptop" style={{ width: 260 }} />
        </Form.Item>
        <Button htmlType="submit" loading={create.isPending}>
          Create token
        </Button>
      </Form>
      {failure ? <Alert type="error" showIcon role="alert" title={failure.problem} description={failure.remedy} style={{ marginTop: 8 }} /> : null}
      {tokens.isPending ? (
        <Skeleton active paragraph={{ rows: 2 }} />
      ) : tokens.isError ? (
        <QueryError what="your tokens" error={tokens.error} onRetry={() => void tokens.refetch()} />
      ) : (
        <Table<ApiTokenInfo>
          rowKey="id"
          size="small"
          className="token-table"
          columns={columns}
          dataSource={tokens.data}
          pagination={false}
          locale={{ emptyText: 'No tokens yet. Create one to use Kiln from a script.' }}
        />
      )}
    </Card>
  );
}
