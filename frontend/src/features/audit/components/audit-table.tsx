import { Table, Tag, Typography } from 'antd';
import type { AuditEntry, Page } from '@dialsheet/common';
import { DateText } from '@/components/ui/date-text';
import { AUDIT_ACTION_COLOURS, AUDIT_ACTION_LABELS, entityLabel } from './audit-labels';
import { AuditDiff } from './audit-diff';

interface AuditTableProps {
  page: Page<AuditEntry> | undefined;
  loading: boolean;
  onPageChange: (offset: number, limit: number) => void;
}

export function AuditTable({ page, loading, onPageChange }: AuditTableProps) {
  const limit = page?.limit ?? 50;
  return (
    <Table<AuditEntry>
      className="data-table audit-table"
      size="small"
      rowKey="id"
      loading={loading}
      dataSource={page?.items ?? []}
      locale={{ emptyText: 'No entries match these filters.' }}
      pagination={{
        total: page?.total ?? 0,
        pageSize: limit,
        current: Math.floor((page?.offset ?? 0) / limit) + 1,
        showSizeChanger: true,
        pageSizeOptions: [25, 50, 100, 200],
        showTotal: (total, [start, end]) => `${start}–${end} of ${total}`,
        onChange: (pageNumber, pageSize) => onPageChange((pageNumber - 1) * pageSize, pageSize),
      }}
      columns={[
        { title: '#', dataIndex: 'seq', width: 70, align: 'right' },
        { title: 'When', dataIndex: 'createdAt', width: 140, render: (v: string) => <DateText value={v} /> },
        {
          title: 'Who',
          key: 'actor',
          width: 160,
          render: (_, entry) => entry.actorName ?? <Typography.Text type="secondary">System</Typography.Text>,
        },
        {
          title: 'What',
          key: 'what',
          width: 190,
          render: (_, entry) => (
            <span>
              <Tag color={AUDIT_ACTION_COLOURS[entry.action] ?? 'default'}>{AUDIT_ACTION_LABELS[entry.action] ?? entry.action}</Tag>
              {entityLabel(entry.entityType)}
            </span>
          ),
        },
        {
          title: 'Before → after',
          key: 'diff',
          render: (_, entry) => (
            <>
              <AuditDiff before={entry.before} after={entry.after} />
              {entry.reason ? (
                <Typography.Text type="secondary" className="audit-reason">
                  Reason: {entry.reason}
                </Typography.Text>
              ) : null}
            </>
          ),
        },
      ]}
    />
  );
}
