import { useMatch, useNavigate } from 'react-router-dom';
import { Select } from 'antd';
import { paths } from '@/config/paths';
import { useCampaigns } from '../api/get-campaigns';

/** Jumps between my campaigns, staying on the same section (members, audit trail) when there is one. */
export function CampaignSwitcher() {
  const navigate = useNavigate();
  const match = useMatch('/campaigns/:campaignId/:section?/*');
  const campaigns = useCampaigns();
  const currentId = match?.params.campaignId;
  const section = match?.params.section;
  const known = campaigns.data?.some((c) => c.id === currentId);

  return (
    <Select
      className="campaign-switcher"
      aria-label="Switch campaign"
      placeholder={campaigns.data?.length === 0 ? 'No campaigns to switch to' : 'Switch campaign…'}
      showSearch={{ optionFilterProp: 'label' }}
      loading={campaigns.isPending}
      value={known ? currentId : undefined}
      options={(campaigns.data ?? []).map((c) => ({ value: c.id, label: c.name }))}
      notFoundContent={campaigns.isError ? 'Could not load campaigns' : 'No campaigns'}
      onChange={(campaignId: string) => {
        if (section === 'members') navigate(paths.campaignMembers.getHref(campaignId));
        else if (section === 'audit') navigate(paths.campaignAudit.getHref(campaignId));
        else navigate(paths.campaign.getHref(campaignId));
      }}
      popupMatchSelectWidth={false}
    />
  );
}
