import type { User } from '@kiln/shared';
import { Card, Descriptions } from 'antd';
import { RoleTag } from '@/components/role-tag';
import { formatDate } from '@/lib/format';
import { roleAbilities } from '@/lib/roles';

/** What Kiln knows about the signed-in person, from `GET /api/auth/me`. */
export function AccountPanel({ user }: { user: User }) {
  return (
    <Card title="Your account" className="panel">
      <Descriptions
        size="small"
        column={1}
        colon={false}
        items={[
          { key: 'name', label: 'Name', children: user.name },
          { key: 'email', label: 'E-mail', children: user.email },
          { key: 'role', label: 'Role', children: <RoleTag role={user.role} /> },
          { key: 'can', label: 'Can', children: roleAbilities[user.role] },
          { key: 'since', label: 'Member since', children: formatDate(user.createdAt) },
        ]}
      />
    </Card>
  );
}
