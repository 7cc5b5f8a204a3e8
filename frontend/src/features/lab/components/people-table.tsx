import type { User } from '@kiln/shared';
import { Card, Skeleton, Table, type TableColumnsType } from 'antd';
import { QueryError } from '@/components/query-error';
import { RoleTag } from '@/components/role-tag';
import { StatusTag } from '@/components/status-tag';
import { formatDate, plural } from '@/lib/format';
import { roleLabel } from '@/lib/roles';
import { useUsers } from '../api/get-users';

const columns: TableColumnsType<User> = [
  {
    title: 'Name',
    dataIndex: 'name',
    sorter: (a, b) => a.name.localeCompare(b.name),
    defaultSortOrder: 'ascend',
  },
  { title: 'E-mail', dataIndex: 'email', sorter: (a, b) => a.email.localeCompare(b.email) },
  {
    title: 'Role',
    dataIndex: 'role',
    render: (_, user) => <RoleTag role={user.role} />,
    sorter: (a, b) => roleLabel[a.role].localeCompare(roleLabel[b.role]),
  },
  {
    title: 'Status',
    dataIndex: 'disabled',
    render: (_, user) =>
      user.disabled ? <StatusTag tone="idle" label="Disabled" /> : <StatusTag tone="ok" label="Active" />,
    sorter: (a, b) => Number(a.disabled) - Number(b.disabled),
  },
  {
    title: 'Member since',
    dataIndex: 'createdAt',
    render: (_, user) => formatDate(user.createdAt),
    sorter: (a, b) => a.createdAt.localeCompare(b.createdAt),
    className: 'numeric-cell',
  },
];

/** The lab's people, from `GET /api/users`. */
export function PeopleTable() {
  const users = useUsers();
  const count = users.data
    ? `${plural(users.data.length, 'person', 'people')}, ${users.data.filter((u) => !u.disabled).length} active`
    : null;

  return (
    <Card title="People" className="panel" extra={count ? <span className="panel__meta">{count}</span> : null}>
      {users.isPending ? (
        <Skeleton active title={false} paragraph={{ rows: 4 }} />
      ) : users.isError ? (
        <QueryError what="the lab's people" error={users.error} onRetry={() => void users.refetch()} />
      ) : (
        <Table<User>
          rowKey="id"
          size="small"
          columns={columns}
          dataSource={users.data}
          pagination={users.data.length > 50 ? { pageSize: 50, showSizeChanger: false } : false}
          locale={{ emptyText: 'No one has an account yet. People are added by the start script or a lab admin.' }}
        />
      )}
    </Card>
  );
}
