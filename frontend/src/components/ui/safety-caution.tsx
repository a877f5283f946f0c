import { Alert } from 'antd';
import { WarningOutlined } from '@ant-design/icons';

/** Shown wherever the rig's hot and pressurised parts are in play. */
export function SafetyCaution() {
  return (
    <Alert
      type="warning"
      showIcon
      icon={<WarningOutlined />}
      className="safety-caution"
      title="Rig safety"
      description={
        <>
          The rig runs warm air streams and carries a pressure gauge: expect hot surfaces and pressurised
          lines. Dialsheet only records readings; setting up, running and opening the rig follows your local
          codes and the practice of qualified people on site.
        </>
      }
    />
  );
}
