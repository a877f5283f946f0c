import { Alert } from 'antd';
import { WarningOutlined } from '@ant-design/icons';

/**
 * Calibrations and balances feed decisions about pressurised gas lines and hot surfaces; a number
 * on a screen must not read as a clearance to act.
 */
export function ResultCaution() {
  return (
    <Alert
      type="warning"
      showIcon
      icon={<WarningOutlined />}
      className="safety-caution"
      title="Results are not a safety clearance"
      description="Calibrations, uncertainties and balances here support engineering judgement. They do not replace local codes, the instrument makers’ instructions or the sign-off of qualified, licensed people for work on pressurised gas or hot parts of the rig."
    />
  );
}
