import { Tag, Tooltip } from 'antd';
import { LockOutlined } from '@ant-design/icons';
import type { Sheet } from '@dialsheet/common';

/** Draft until a reader and a checker are assigned; open for entry after; locked inside a release. */
export function SheetStatusTag({ sheet }: { sheet: Sheet }) {
  if (sheet.lock) {
    return (
      <Tooltip title={`Inside release ${sheet.lock.releaseNumber}: nothing on the sheet may change`}>
        <Tag icon={<LockOutlined />}>locked</Tag>
      </Tooltip>
    );
  }
  if (sheet.status === 'draft') {
    return (
      <Tooltip title="Assign a reader and a checker to open it for entry">
        <Tag>draft</Tag>
      </Tooltip>
    );
  }
  return <Tag color="green">open</Tag>;
}
