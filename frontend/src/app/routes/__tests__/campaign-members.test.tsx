import { describe, expect, it } from 'vitest';
import type { CampaignRole } from '@dialsheet/common';
import { findDialog, renderApp, screen, within } from '@/testing/test-utils';
import { makeCampaign, makeInvitation, makeMember, makeUser } from '@/testing/fixtures';
import { apiError, type StubRequest, type StubRoutes } from '@/testing/fetch-stub';

const campaignId = '10000000-0000-4000-8000-000000000001';

function renderMembersAs(myRoles: CampaignRole[], extraRoutes: StubRoutes = {}) {
  const me = makeUser();
  return renderApp(`/campaigns/${campaignId}/members`, {
    user: me,
    routes: {
      'GET /api/campaigns': { body: [makeCampaign({ myRoles })] },
      'GET /api/campaigns/:campaignId': { body: makeCampaign({ myRoles }) },
      'GET /api/campaigns/:campaignId/members': {
        body: [makeMember({ userId: me.id, name: me.name, email: me.email, roles: myRoles }), makeMember()],
      },
      'GET /api/campaigns/:campaignId/invitations': { body: [makeInvitation()] },
      ...extraRoutes,
    },
  });
}

describe('members page', () => {
  it('lets a lead invite, change roles and see pending invitations', async () => {
    const { network } = renderMembersAs(['lead']);

    expect(await screen.findByRole('button', { name: /Invite by e-mail/ })).toBeInTheDocument();
    const readerRow = (await screen.findByText('Rudi Reader')).closest('tr')!;
    expect(within(readerRow).getByText('Reader')).toBeInTheDocument();
    expect(within(readerRow).getByRole('button', { name: 'Change roles of Rudi Reader' })).toBeInTheDocument();
    expect(await screen.findByText('new.checker@example.org')).toBeInTheDocument();
    expect(network.callsTo('GET /api/campaigns/:campaignId/invitations')).toHaveLength(1);
  });

  it('shows a reader the list only: no invite button, no role changes, no invitation request', async () => {
    const { network } = renderMembersAs(['reader']);

    expect(await screen.findByText('Rudi Reader')).toBeInTheDocument();
    expect(screen.getByText('Only a lead of this campaign can invite people or change roles.')).toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /Invite by e-mail/ })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /Change roles/ })).not.toBeInTheDocument();
    expect(network.callsTo('GET /api/campaigns/:campaignId/invitations')).toHaveLength(0);
  });

  it('sends an invitation with the chosen roles and lists it as pending', async () => {
    const pending = [makeInvitation()];
    const { user, network } = renderMembersAs(['lead'], {
      'GET /api/campaigns/:campaignId/invitations': () => ({ body: pending }),
      'POST /api/campaigns/:campaignId/invitations': ({ body }: StubRequest) => {
        const { email, roles } = body as { email: string; roles: CampaignRole[] };
        const invitation = makeInvitation({ id: '20000000-0000-4000-8000-000000000002', email, roles });
        pending.push(invitation);
        return { status: 201, body: invitation };
      },
    });

    await user.click(await screen.findByRole('button', { name: /Invite by e-mail/ }));
    const dialog = await findDialog('Invite someone to this campaign');
    await user.type(within(dialog).getByLabelText('E-mail'), 'ola.checker@example.org');
    await user.click(within(dialog).getByRole('checkbox', { name: /Checker/ }));
    await user.click(within(dialog).getByRole('button', { name: 'Send invitation' }));

    expect(await screen.findByText('ola.checker@example.org')).toBeInTheDocument();
    expect(network.callsTo('POST /api/campaigns/:campaignId/invitations')[0].body).toEqual({
      email: 'ola.checker@example.org',
      roles: ['reader', 'checker'],
    });
  });

  it("shows the server's refusal when a lead removes the last lead", async () => {
    const { user } = renderMembersAs(['lead'], {
      'DELETE /api/campaigns/:campaignId/members/:userId': apiError(409, 'A campaign needs at least one lead'),
    });
    await user.click(await screen.findByRole('button', { name: 'Remove Lena Lead' }));
    await user.click(await screen.findByRole('button', { name: 'Remove' }));
    expect(await screen.findByText('A campaign needs at least one lead')).toBeInTheDocument();
  });
});
