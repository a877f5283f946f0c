import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { Button, Card, Col, Row, Tag } from 'antd';
import { AuditOutlined, EditOutlined, LineChartOutlined, PercentageOutlined, RightOutlined, TeamOutlined, VideoCameraOutlined } from '@ant-design/icons';
import { paths } from '@/config/paths';
import { PageHeader } from '@/components/ui/page-header';
import { SafetyCaution } from '@/components/ui/safety-caution';
import { useDocumentTitle } from '@/hooks/use-document-title';
import { useCampaign } from '@/features/campaigns/api/get-campaign';
import { CampaignSummary } from '@/features/campaigns/components/campaign-summary';
import { EditCampaignModal } from '@/features/campaigns/components/edit-campaign-modal';
import { ArchiveCampaignButton } from '@/features/campaigns/components/archive-campaign-button';
import { DashboardOutlined, SafetyCertificateOutlined } from '@ant-design/icons';

export function CampaignOverviewRoute() {
  const { campaignId = '' } = useParams();
  const { data: campaign } = useCampaign({ campaignId });
  const [editing, setEditing] = useState(false);
  useDocumentTitle(campaign?.name);
  if (!campaign) return null;

  const isLead = campaign.myRoles.includes('lead');

  return (
    <>
      <PageHeader
        title={
          <>
            {campaign.name} {campaign.status === 'archived' ? <Tag className="title-tag">Archived</Tag> : null}
          </>
        }
        subtitle="Campaign overview"
        actions={
          isLead ? (
            <>
              <Button icon={<EditOutlined />} onClick={() => setEditing(true)}>
                Edit
              </Button>
              <ArchiveCampaignButton campaign={campaign} />
            </>
          ) : null
        }
      />
      <Row gutter={[16, 16]}>
        <Col xs={24} xl={16}>
          <CampaignSummary campaign={campaign} />
        </Col>
        <Col xs={24} xl={8}>
          <Card size="small" className="section-card" title="Runs, people and record">
            <nav className="overview-links" aria-label="Campaign pages">
              <Link to={paths.campaignRuns.getHref(campaign.id)} className="overview-link">
                <VideoCameraOutlined /> Runs <span className="overview-link-count">videos and sync</span> <RightOutlined />
              </Link>
              <Link to={paths.campaignMembers.getHref(campaign.id)} className="overview-link">
                <TeamOutlined /> Members <span className="overview-link-count">{campaign.memberCount}</span> <RightOutlined />
              </Link>
              <Link to={paths.campaignAnalysis.getHref(campaign.id)} className="overview-link">
                <LineChartOutlined /> Analysis <span className="overview-link-count">calibrations and stable values</span> <RightOutlined />
              </Link>
              <Link to={paths.campaignBalance.getHref(campaign.id)} className="overview-link">
                <PercentageOutlined /> Balances <span className="overview-link-count">mass and energy closure</span> <RightOutlined />
              </Link>
              {campaign.myRoles.includes('lead') || campaign.myRoles.includes('engineer') ? (
                <Link to={paths.campaignDashboard.getHref(campaign.id)} className="overview-link">
                  <DashboardOutlined /> Dashboard <span className="overview-link-count">progress and readiness</span> <RightOutlined />
                </Link>
              ) : null}
              <Link to={paths.campaignReleases.getHref(campaign.id)} className="overview-link">
                <SafetyCertificateOutlined /> Releases <span className="overview-link-count">sign-off and export</span> <RightOutlined />
              </Link>
              <Link to={paths.campaignAudit.getHref(campaign.id)} className="overview-link">
                <AuditOutlined /> Audit trail <span className="overview-link-count">every change</span> <RightOutlined />
              </Link>
            </nav>
          </Card>
        </Col>
        <Col span={24}>
          <SafetyCaution />
        </Col>
      </Row>
      {isLead ? <EditCampaignModal campaign={campaign} open={editing} onClose={() => setEditing(false)} /> : null}
    </>
  );
}
