import { DEFAULT_QUOTAS, ROLES, type Role, type User } from '@kiln/shared';
import { Alert, App, Button, Card, Select, Skeleton, Table, type TableColumnsType } from 'antd';
import { useState } from 'react';
import { QueryError } from '@/components/query-error';
import { RoleTag } from '@/components/role-tag';
import { StatusTag } from '@/components/status-tag';
import { describeError } from '@/lib/describe-error';
import { formatCpuHours, formatDate, plural } from '@/lib/format';
import { roleAbilities, roleLabel } from '@/lib/roles';
import { usePeople } from '../api/get-people';
import { useUpdatePerson } from '../api/update-person';

interface Failure {
  who: string;
  what: string;
  error: unknown;
}

const roleOptions = ROLES.map((role) => ({ value: role, label: roleLabel[role] }));

/** The lab's people with their role and access, changeable by a lab admin after a confirmation. */
export function PeopleAdminPanel({ me }: { me: User }) {
  const people = usePeople();
  const update = useUpdatePerson();
  const { modal, message } = App.useApp();
  const [failure, setFailure] = useState<Failure | null>(null);
  const [busyId, setBusyId] = useState<string | null>(null);

  function change(person: User, what: string, body: { role?: Role; disabled?: boolean }, done: string) {
    setFailure(null);
    setBusyId(person.id);
    return update
      .mutateAsync({ id: person.id, change: body })
      .then(() => void message.success(done))
      .catch((error: unknown) => setFailure({ who: person.name, what, error }))
      .finally(() => setBusyId(null));
  }

  function confirmRole(person: User, role: Role) {
    const quota = DEFAULT_QUOTAS[role];
    modal.confirm({
      title: `Make ${person.name} a ${roleLabel[role].toLowerCase()}?`,
      content: (
        <div className="confirm-body">
          <p>
            {roleLabel[role]}s can {roleAbilities[role].charAt(0).toLowerCase() + roleAbilities[role].slice(1)}
          </p>
          <p className="muted">
            Unless a custom quota is set for them, their quota becomes the {roleLabel[role].toLowerCase()} default: {plural(quota.slots, 'slot', 'slots')},{' '}
            {formatCpuHours(quota.cpuHoursPerMonth)} a month. The change is written to the audit log.
          </p>
        </div>
      ),
      okText: `Make ${roleLabel[role].toLowerCase()}`,
      cancelText: 'Keep as is',
      onOk: () => change(person, `change the role of ${person.name}`, { role }, `${person.name} is now a ${roleLabel[role].toLowerCase()}.`),
    });
  }

  function confirmAccess(person: User) {
    const disabling = !person.disabled;
    modal.confirm({
      title: disabling ? `Disable ${person.name}'s account?` : `Enable ${person.name}'s account again?`,
      content: disabling ? (
        <div className="confirm-body">
          <p>They are signed out and cannot sign in or use API tokens until an admin enables the account again.</p>
          <p className="muted">Their studies, runs and checkpoints stay as they are. The change is written to the audit log.</p>
        </div>
      ) : (
        <div className="confirm-body">
          <p>They can sign in again with their existing password, with the role and quota they had.</p>
        </div>
      ),
      okText: disabling ? 'Disable account' : 'Enable account',
      okButtonProps: disabling ? { danger: true } : undefined,
      cancelText: 'Keep as is',
      onOk: () =>
        change(
          person,
          `${disabling ? 'disable' : 'enable'} ${person.name}`,
          { disabled: disabling },
          disabling ? `${person.name}'s account is disabled.` : `${person.name}'s account is enabled.`,
        ),
    });
  }

  const columns: TableColumnsType<User> = [
    {
      title: 'Name',
      dataIndex: 'name',
      sorter: (a, b) => a.name.localeCompare(b.name),
      defaultSortOrder: 'ascend',
      render: (_, person) => (
        <>
          <div className="strong-text">
            {person.name}
            {person.id === me.id ? <span className="muted"> (you)</span> : null}
          </div>
          <div className="table-sub">{person.email}</div>
        </>
      ),
    },
    {
      title: 'Role',
      dataIndex: 'role',
      width: 200,
      sorter: (a, b) => roleLabel[a.role].localeCompare(roleLabel[b.role]),
      render: (_, person) =>
        person.id === me.id ? (
          <span title="You cannot give up your own admin role; another lab admin can.">
            <RoleTag role={person.role} />
          </span>
        ) : (
          <Select<Role>
            size="small"
            value={person.role}
            options={roleOptions}
            style={{ width: 150 }}
            aria-label={`Role of ${person.name}`}
            disabled={busyId === person.id}
            onChange={(role) => confirmRole(person, role)}
          />
        ),
    },
    {
      title: 'Access',
      dataIndex: 'disabled',
      width: 130,
      sorter: (a, b) => Number(a.disabled) - Number(b.disabled),
      render: (_, person) =>
        person.disabled ? (
          <StatusTag tone="idle" label="Disabled" title="Cannot sign in" />
        ) : (
          <StatusTag tone="ok" label="Active" title="Can sign in" />
        ),
    },
    {
      title: 'Member since',
      dataIndex: 'createdAt',
      width: 140,
      className: 'numeric-cell',
      sorter: (a, b) => a.createdAt.localeCompare(b.createdAt),
      render: (_, person) => formatDate(person.createdAt),
    },
    {
      title: <span className="visually-hidden">Actions</span>,
      key: 'actions',
      width: 110,
      align: 'right',
      render: (_, person) =>
        person.id === me.id ? null : (
          <Button size="small" danger={!person.disabled} loading={busyId === person.id} onClick={() => confirmAccess(person)}>
            {person.disabled ? 'Enable' : 'Disable'}
          </Button>
        ),
    },
  ];

  const count = people.data
    ? `${plural(people.data.length, 'person', 'people')}, ${people.data.filter((u) => !u.disabled).length} active`
    : null;

  return (
    <Card title="People" className="panel" extra={count ? <span className="panel__meta">{count}</span> : null}>
      {failure ? (
        <Alert
          className="panel__alert"
          type="error"
          showIcon
          closable={{ onClose: () => setFailure(null) }}
          title={`Could not ${failure.what}.`}
          description={
            <>
              <div>{describeError(failure.error).problem}</div>
              <div>{describeError(failure.error).remedy}</div>
            </>
          }
        />
      ) : null}
      {people.isPending ? (
        <Skeleton active title={false} paragraph={{ rows: 4 }} />
      ) : people.isError ? (
        <QueryError what="the lab's people" error={people.error} onRetry={() => void people.refetch()} />
      ) : (
        <Table<User>
          rowKey="id"
          size="small"
          columns={columns}
          dataSource={people.data}
          rowClassName={(person) => (person.disabled ? 'row--disabled' : '')}
          pagination={people.data.length > 50 ? { pageSize: 50, showSizeChanger: false } : false}
          locale={{ emptyText: 'No one has an account yet. The start script creates the first lab admin.' }}
        />
      )}
      <p className="panel__note" data-testid="invite-note">
        Inviting people by e-mail is not in Kiln yet: it arrives with e-mail support in a later release. Until then, the
        accounts here are the ones Kiln's start script created (the first lab admin and the demo lab); you can change
        their roles, access and quotas.
      </p>
    </Card>
  );
}
