import { Link } from 'react-router-dom';
import { Table, Tag, Tooltip, Typography } from 'antd';
import { CheckCircleOutlined } from '@ant-design/icons';
import { describeSync, type Run } from '@dialsheet/common';
import { paths } from '@/config/paths';
import { RecordingStatusTag } from '@/components/ui/recording-status-tag';

/** The first 12 hex digits tell files apart at a glance; the whole hash is on hover and on the run page. */
export function shortHash(sha256: string): string {
  return sha256.slice(0, 12);
}

function syncText(run: Run): string | null {
  if (!run.sync) return null;
  try {
    return describeSync(run.sync).summary;
  } catch {
    return null;
  }
}

export function RunsTable({ runs }: { runs: Run[] }) {
  return (
    <Table<Run>
      className="data-table"
      size="middle"
      rowKey="id"
      dataSource={runs}
      pagination={runs.length > 50 ? { pageSize: 50, showSizeChanger: false } : false}
      columns={[
        {
          title: 'Run',
          key: 'name',
          sorter: (a, b) => a.name.localeCompare(b.name, undefined, { numeric: true }),
          render: (_, run) => (
            <Link to={paths.run.getHref(run.campaignId, run.id)} className="campaign-link">
              {run.name}
            </Link>
          ),
        },
        {
          title: 'Date',
          dataIndex: 'runDate',
          width: 120,
          sorter: (a, b) => (a.runDate ?? '').localeCompare(b.runDate ?? ''),
          render: (value: string | null) =>
            value ? <span className="numeric">{value}</span> : <Typography.Text type="secondary">–</Typography.Text>,
        },
        {
          title: 'Configuration',
          dataIndex: 'configuration',
          ellipsis: { showTitle: true },
          render: (value: string) => value || <Typography.Text type="secondary">–</Typography.Text>,
        },
        {
          title: 'Video',
          key: 'recording',
          width: 230,
          render: (_, run) => <RecordingStatusTag recording={run.recording} />,
        },
        {
          title: 'Fingerprint',
          key: 'sha256',
          width: 150,
          render: (_, run) =>
            run.recording ? (
              <Tooltip title={`SHA-256 ${run.recording.sha256}`}>
                <code className="hash-text">{shortHash(run.recording.sha256)}</code>
              </Tooltip>
            ) : (
              <Typography.Text type="secondary">–</Typography.Text>
            ),
        },
        {
          title: 'Sync',
          key: 'sync',
          width: 90,
          render: (_, run) => {
            const text = syncText(run);
            return text ? (
              <Tooltip title={text}>
                <Tag icon={<CheckCircleOutlined />} color="green">
                  Set
                </Tag>
              </Tooltip>
            ) : (
              <Typography.Text type="secondary">Not set</Typography.Text>
            );
          },
        },
      ]}
    />
  );
}
