// Every front-end path in one place; e-mail links built by the server use the same ones.
export const paths = {
  signIn: {
    path: '/sign-in',
    getHref: (next?: string | null) =>
      next && next !== '/' && !next.startsWith('/sign-in') ? `/sign-in?next=${encodeURIComponent(next)}` : '/sign-in',
  },
  resetPassword: { path: '/reset-password', getHref: () => '/reset-password' },
  resetPasswordConfirm: {
    path: '/reset-password/confirm',
    getHref: (token: string) => `/reset-password/confirm?token=${encodeURIComponent(token)}`,
  },
  acceptInvitation: {
    path: '/invitations/accept',
    getHref: (token: string) => `/invitations/accept?token=${encodeURIComponent(token)}`,
  },
  home: { path: '/', getHref: () => '/' },
  campaigns: { path: '/campaigns', getHref: () => '/campaigns' },
  campaign: { path: '/campaigns/:campaignId', getHref: (campaignId: string) => `/campaigns/${campaignId}` },
  campaignMembers: {
    path: '/campaigns/:campaignId/members',
    getHref: (campaignId: string) => `/campaigns/${campaignId}/members`,
  },
  campaignRuns: {
    path: '/campaigns/:campaignId/runs',
    getHref: (campaignId: string) => `/campaigns/${campaignId}/runs`,
  },
  campaignChannels: {
    path: '/campaigns/:campaignId/channels',
    getHref: (campaignId: string) => `/campaigns/${campaignId}/channels`,
  },
  run: {
    path: '/campaigns/:campaignId/runs/:runId',
    getHref: (campaignId: string, runId: string) => `/campaigns/${campaignId}/runs/${runId}`,
  },
  sheet: {
    path: '/campaigns/:campaignId/sheets/:sheetId',
    getHref: (campaignId: string, sheetId: string) => `/campaigns/${campaignId}/sheets/${sheetId}`,
  },
  sheetEntry: {
    path: '/campaigns/:campaignId/sheets/:sheetId/entry',
    getHref: (campaignId: string, sheetId: string) => `/campaigns/${campaignId}/sheets/${sheetId}/entry`,
  },
  campaignAudit: {
    path: '/campaigns/:campaignId/audit',
    getHref: (campaignId: string) => `/campaigns/${campaignId}/audit`,
  },
  campaignAnalysis: {
    path: '/campaigns/:campaignId/analysis',
    getHref: (campaignId: string) => `/campaigns/${campaignId}/analysis`,
  },
  campaignBalance: {
    path: '/campaigns/:campaignId/balance',
    getHref: (campaignId: string) => `/campaigns/${campaignId}/balance`,
  },
  runAnalysis: {
    path: '/campaigns/:campaignId/runs/:runId/analysis',
    getHref: (campaignId: string, runId: string) => `/campaigns/${campaignId}/runs/${runId}/analysis`,
  },
  campaignDashboard: {
    path: '/campaigns/:campaignId/dashboard',
    getHref: (campaignId: string) => `/campaigns/${campaignId}/dashboard`,
  },
  campaignReleases: {
    path: '/campaigns/:campaignId/releases',
    getHref: (campaignId: string) => `/campaigns/${campaignId}/releases`,
  },
  releaseReport: {
    path: '/campaigns/:campaignId/releases/:releaseId/report',
    getHref: (campaignId: string, releaseId: string) => `/campaigns/${campaignId}/releases/${releaseId}/report`,
  },
  account: { path: '/account', getHref: () => '/account' },
  adminMail: { path: '/admin/mail', getHref: (mailId?: string) => (mailId ? `/admin/mail?id=${encodeURIComponent(mailId)}` : '/admin/mail') },
  adminUsers: { path: '/admin/users', getHref: () => '/admin/users' },
} as const;

/** Only same-site relative paths are accepted as a post-sign-in destination. */
export function safeNextPath(next: string | null | undefined): string {
  if (!next || !next.startsWith('/') || next.startsWith('//') || next.startsWith('/sign-in')) {
    return paths.campaigns.getHref();
  }
  return next;
}
