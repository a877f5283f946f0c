import { Alert } from 'antd';
import { LockOutlined } from '@ant-design/icons';
import type { DataLock } from '@dialsheet/common';

/** A sheet inside a signed-off release cannot change; a correction needs a new release version. */
export function SheetLockBanner({ lock }: { lock: DataLock }) {
  return (
    <Alert
      type="info"
      showIcon
      icon={<LockOutlined />}
      className="sheet-lock-banner"
      title={`Locked by release ${lock.releaseNumber}`}
      description="The run's data is inside a signed-off release, so entries and resolutions on this sheet cannot change. A correction goes into a new release version."
    />
  );
}
