import { Link, useNavigate, useSearchParams } from 'react-router-dom';
import { Alert, App, Result, Skeleton } from 'antd';
import { paths } from '@/config/paths';
import { AuthLayout } from '@/components/layouts/auth-layout';
import { useUser } from '@/lib/auth';
import { errorMessage } from '@/lib/api-client';
import { useDocumentTitle } from '@/hooks/use-document-title';
import { useInvitationPreview } from '@/features/members/api/get-invitation-preview';
import { AcceptInvitationForm } from '@/features/members/components/accept-invitation-form';

function InvitationBody({ token }: { token: string }) {
  const navigate = useNavigate();
  const { message } = App.useApp();
  const preview = useInvitationPreview({ token });
  const signedIn = useUser().data;

  if (preview.isPending) return <Skeleton active paragraph={{ rows: 6 }} />;
  if (preview.isError) {
    return (
      <Result
        status="warning"
        title={errorMessage(preview.error)}
        subTitle="Ask the campaign lead to send a new invitation."
        extra={<Link to={paths.signIn.getHref()}>Go to sign in</Link>}
      />
    );
  }

  const invitation = preview.data;
  return (
    <>
      {signedIn && signedIn.email.toLowerCase() !== invitation.email.toLowerCase() ? (
        <Alert
          type="info"
          showIcon
          className="form-alert"
          title={`You are signed in as ${signedIn.email}.`}
          description={`Accepting signs this browser in as ${invitation.email} instead.`}
        />
      ) : null}
      <AcceptInvitationForm
        token={token}
        preview={invitation}
        onAccepted={() => {
          void message.success(`Welcome to ${invitation.campaignName}`);
          navigate(invitation.campaignId ? paths.campaign.getHref(invitation.campaignId) : paths.campaigns.getHref(), {
            replace: true,
          });
        }}
      />
    </>
  );
}

export function AcceptInvitationRoute() {
  useDocumentTitle('Join a campaign');
  const [searchParams] = useSearchParams();
  const token = searchParams.get('token');

  return (
    <AuthLayout title="You are invited to a campaign" width={460}>
      {token ? (
        <InvitationBody token={token} />
      ) : (
        <Result
          status="warning"
          title="This link is incomplete"
          subTitle="Open the link from the invitation e-mail exactly as it was sent."
        />
      )}
    </AuthLayout>
  );
}
