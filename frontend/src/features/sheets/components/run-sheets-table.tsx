import { Link } from 'react-router-dom';
import { Button, Space, Table, Tooltip, Typography } from 'antd';
import { EditOutlined, TeamOutlined } from '@ant-design/icons';
import type { CampaignMember, Sheet } from '@dialsheet/common';
import { paths } from '@/config/paths';
import { formatCount, formatInterval, formatTime, memberName } from '../utils/sheet-format';
import { PassProgress } from './pass-progress';
import { SheetStatusTag } from './sheet-status-tag';
import { DeleteSheetButton } from './delete-sheet-button';

interface RunSheetsTableProps {
  sheets: Sheet[];
  members: CampaignMember[];
  canPlan: boolean;
  onAssign: (sheet: Sheet) => void;
  onEdit: (sheet: Sheet) => void;
  onDeleteError: (sheet: Sheet, message: string) => void;
}

function Person({ name }: { name: string | null }) {
  return name ? <span>{name}</span> : <Typography.Text type="secondary">not assigned</Typography.Text>;
}

/** The run's sheets: plan, who reads and checks, and how far each pass has come. */
export function RunSheetsTable({ sheets, members, canPlan, onAssign, onEdit, onDeleteError }: RunSheetsTableProps) {
  return (
    <Table<Sheet>
      className="data-table run-sheets-table"
      size="small"
      rowKey="id"
      dataSource={sheets}
      pagination={false}
      scroll={{ x: 'max-content' }}
      columns={[
        {
          title: 'Sheet',
          key: 'name',
          render: (_, sheet) => (
            <Space orientation="vertical" size={0}>
              <Link to={paths.sheet.getHref(sheet.campaignId, sheet.id)} className="sheet-link">
                {sheet.name}
              </Link>
              <SheetStatusTag sheet={sheet} />
            </Space>
          ),
        },
        {
          title: 'Plan',
          key: 'plan',
          render: (_, sheet) => (
            <span className="numeric sheet-plan">
              <span>
                {formatCount(sheet.rowCount)} rows × {sheet.channelIds.length} channel{sheet.channelIds.length === 1 ? '' : 's'}
              </span>
              <Typography.Text type="secondary">
                every {formatInterval(sheet.interval)}, {formatTime(sheet.startTime)} – {formatTime(sheet.endTime)}
              </Typography.Text>
            </span>
          ),
        },
        {
          title: 'Reader',
          key: 'reader',
          render: (_, sheet) => <Person name={memberName(members, sheet.readerId)} />,
        },
        {
          title: 'Checker',
          key: 'checker',
          render: (_, sheet) => <Person name={memberName(members, sheet.checkerId)} />,
        },
        {
          title: 'Progress',
          key: 'progress',
          width: 220,
          render: (_, sheet) => (
            <div className="sheet-progress-pair">
              <PassProgress pass={1} progress={sheet.progress.pass1} finishedAt={sheet.pass1FinishedAt} />
              <PassProgress pass={2} progress={sheet.progress.pass2} finishedAt={sheet.pass2FinishedAt} />
            </div>
          ),
        },
        ...(canPlan
          ? [
              {
                title: <span className="visually-hidden">Actions</span>,
                key: 'actions',
                width: 104,
                render: (_: unknown, sheet: Sheet) =>
                  sheet.lock ? null : (
                    <Space size={0}>
                      <Tooltip title="Assign reader and checker">
                        <Button size="small" type="text" icon={<TeamOutlined />} aria-label={`Assign ${sheet.name}`} onClick={() => onAssign(sheet)} />
                      </Tooltip>
                      <Tooltip title="Edit the plan">
                        <Button size="small" type="text" icon={<EditOutlined />} aria-label={`Edit ${sheet.name}`} onClick={() => onEdit(sheet)} />
                      </Tooltip>
                      <DeleteSheetButton sheet={sheet} onError={(message) => onDeleteError(sheet, message)} />
                    </Space>
                  ),
              },
            ]
          : []),
      ]}
    />
  );
}
