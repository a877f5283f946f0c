import { Card, Descriptions, Typography } from 'antd';
import type { Run } from '@dialsheet/common';
import { DateText } from '@/components/ui/date-text';

const dash = <Typography.Text type="secondary">–</Typography.Text>;

export function RunDetails({ run }: { run: Run }) {
  return (
    <Card size="small" className="section-card" title="About this run">
      <Descriptions
        colon={false}
        size="small"
        column={1}
        items={[
          { key: 'date', label: 'Day of the test', children: run.runDate ? <span className="numeric">{run.runDate}</span> : dash },
          { key: 'configuration', label: 'Configuration', children: run.configuration || dash },
          { key: 'operator', label: 'Operator', children: run.operator || dash },
          {
            key: 'notes',
            label: 'Notes',
            children: run.notes ? <span className="pre-wrap">{run.notes}</span> : dash,
          },
          { key: 'updated', label: 'Last change', children: <DateText value={run.updatedAt} /> },
        ]}
      />
    </Card>
  );
}
