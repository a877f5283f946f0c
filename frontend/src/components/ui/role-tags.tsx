import { Space, Tag } from 'antd';
import { CAMPAIGN_ROLES, CAMPAIGN_ROLE_LABELS, type CampaignRole } from '@dialsheet/common';

// One quiet colour per role, always in the same order, so a column of tags scans quickly.
const ROLE_COLOURS: Record<CampaignRole, string> = {
  reader: 'default',
  checker: 'blue',
  engineer: 'gold',
  lead: 'green',
};

export function sortRoles(roles: readonly CampaignRole[]): CampaignRole[] {
  return CAMPAIGN_ROLES.filter((role) => roles.includes(role));
}

export function RoleTags({ roles }: { roles: readonly CampaignRole[] }) {
  if (roles.length === 0) return <Tag>No role</Tag>;
  return (
    <Space size={4} wrap>
      {sortRoles(roles).map((role) => (
        <Tag key={role} color={ROLE_COLOURS[role]} className="role-tag">
          {CAMPAIGN_ROLE_LABELS[role]}
        </Tag>
      ))}
    </Space>
  );
}

export const roleOptions = CAMPAIGN_ROLES.map((role) => ({ label: CAMPAIGN_ROLE_LABELS[role], value: role }));
