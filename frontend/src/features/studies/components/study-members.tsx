import type { Study } from '@kiln/shared';
import { Card } from 'antd';

const roleWord = { owner: 'Owner', member: 'Member', viewer: 'Viewer (can only look)' } as const;

export function StudyMembers({ study }: { study: Study }) {
  return (
    <Card title="Members" className="panel" size="small" extra={<span className="panel__meta">{study.members.length}</span>}>
      <ul className="member-list">
        {study.members.map((m) => (
          <li key={m.userId}>
            <div className="member-list__name">{m.name}</div>
            <div className="member-list__meta">
              {roleWord[m.role]} · {m.email}
            </div>
          </li>
        ))}
      </ul>
      <p className="panel__note">People join a study by an e-mail invitation from its owner or a lab admin.</p>
    </Card>
  );
}
