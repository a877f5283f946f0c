import { Card, Descriptions, Skeleton } from 'antd';
import { ErrorState } from '@/components/feedback/error-state';
import { DateText } from '@/components/ui/date-text';
import { useMail } from '../api/get-mail';
import { LinkedText } from './linked-text';

export function MailMessage({ mailId }: { mailId: string }) {
  const mail = useMail({ mailId });

  if (mail.isPending) {
    return (
      <Card size="small" className="section-card">
        <Skeleton active paragraph={{ rows: 8 }} />
      </Card>
    );
  }
  if (mail.isError) return <ErrorState error={mail.error} onRetry={() => void mail.refetch()} />;

  const message = mail.data;
  return (
    <Card size="small" className="section-card mail-message" title={message.subject || '(no subject)'}>
      <Descriptions
        colon={false}
        size="small"
        column={1}
        items={[
          { key: 'from', label: 'From', children: message.from },
          { key: 'to', label: 'To', children: message.to.join(', ') },
          { key: 'received', label: 'Received', children: <DateText value={message.receivedAt} /> },
        ]}
      />
      <LinkedText text={message.text} />
    </Card>
  );
}
