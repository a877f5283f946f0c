import { Table, Typography } from 'antd';
import type { CapturedMail } from '@dialsheet/common';
import { DateText } from '@/components/ui/date-text';

interface MailListProps {
  mails: CapturedMail[];
  selectedId: string | undefined;
  onOpen: (mailId: string) => void;
}

export function MailList({ mails, selectedId, onOpen }: MailListProps) {
  return (
    <Table<CapturedMail>
      className="data-table mail-list"
      tableLayout="fixed"
      size="small"
      rowKey="id"
      dataSource={mails}
      pagination={mails.length > 50 ? { pageSize: 50, showSizeChanger: false } : false}
      rowClassName={(mail) => (mail.id === selectedId ? 'row-selected' : 'row-clickable')}
      onRow={(mail) => ({
        onClick: () => onOpen(mail.id),
        onKeyDown: (event) => {
          if (event.key === 'Enter') onOpen(mail.id);
        },
        tabIndex: 0,
        'aria-selected': mail.id === selectedId,
      })}
      columns={[
        { title: 'Received', dataIndex: 'receivedAt', width: 140, render: (v: string) => <DateText value={v} /> },
        {
          title: 'Message',
          key: 'message',
          render: (_, mail) => (
            <div className="mail-row">
              <Typography.Text strong ellipsis>
                {mail.subject || '(no subject)'}
              </Typography.Text>
              <Typography.Text type="secondary" ellipsis className="mail-row-to">
                to {mail.to.join(', ')}
              </Typography.Text>
            </div>
          ),
        },
      ]}
    />
  );
}
