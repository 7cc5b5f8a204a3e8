import type { Study } from '@kiln/shared';
import { Table, type TableColumnsType } from 'antd';
import { Link } from 'react-router-dom';
import { paths } from '@/config/paths';
import { formatDate } from '@/lib/format';

const roleWord = { owner: 'Owner', member: 'Member', viewer: 'Viewer' } as const;

const columns: TableColumnsType<Study> = [
  {
    title: 'Study',
    dataIndex: 'name',
    render: (_, study) => (
      <div>
        <Link to={paths.study.getHref(study.id)} className="strong-link">
          {study.name}
        </Link>
        {study.description ? <div className="table-sub">{study.description}</div> : null}
      </div>
    ),
    sorter: (a, b) => a.name.localeCompare(b.name),
  },
  {
    title: 'Your part',
    dataIndex: 'myRole',
    width: 130,
    render: (_, study) => (study.myRole ? roleWord[study.myRole] : 'Lab admin (not a member)'),
  },
  {
    title: 'Created',
    dataIndex: 'createdAt',
    width: 130,
    render: (_, study) => formatDate(study.createdAt),
    sorter: (a, b) => a.createdAt.localeCompare(b.createdAt),
    defaultSortOrder: 'descend',
    className: 'numeric-cell',
  },
];

export function StudiesTable({ studies, emptyText }: { studies: Study[]; emptyText: string }) {
  return (
    <Table<Study>
      rowKey="id"
      size="small"
      columns={columns}
      dataSource={studies}
      pagination={studies.length > 25 ? { pageSize: 25, showSizeChanger: false } : false}
      locale={{ emptyText }}
    />
  );
}
