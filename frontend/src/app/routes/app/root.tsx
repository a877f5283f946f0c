import { ProtectedRoute } from '@/lib/auth';
import { AppShell } from '@/components/layouts/app-shell';
import { CampaignSwitcher } from '@/features/campaigns/components/campaign-switcher';

/** Every signed-in page: the shell (header, campaign switcher, navigation, shortcuts) around the page. */
export function AppRoot() {
  return (
    <ProtectedRoute>
      <AppShell campaignSwitcher={<CampaignSwitcher />} />
    </ProtectedRoute>
  );
}
