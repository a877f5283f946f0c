import { useMemo, useState, type ReactNode } from 'react';
import { Link, Outlet, useLocation, useMatch, useNavigate } from 'react-router-dom';
import { Avatar, Button, Dropdown, Layout, Menu, Tooltip, Typography, type MenuProps } from 'antd';
import {
  AuditOutlined,
  DashboardFilled,
  DashboardOutlined,
  LogoutOutlined,
  MailOutlined,
  TeamOutlined,
  UnorderedListOutlined,
  UserOutlined,
  QuestionCircleOutlined,
  VideoCameraOutlined,
  SafetyCertificateOutlined,
} from '@ant-design/icons';
import { paths } from '@/config/paths';
import { useSignOut, useUser } from '@/lib/auth';
import { BrandMark } from '@/components/ui/brand-mark';
import { ShortcutSheet, type ShortcutEntry } from '@/components/shortcuts/shortcut-sheet';
import { useKeySequences, type KeyBinding } from '@/components/shortcuts/use-key-sequences';
import { PageShortcutsProvider } from '@/components/shortcuts/page-shortcuts';

interface AppShellProps {
  /** The campaign picker, composed by the route so this layout stays free of feature code. */
  campaignSwitcher?: ReactNode;
  children?: ReactNode;
}

interface Shortcut extends ShortcutEntry {
  run: () => void;
}

function initials(name: string): string {
  const parts = name.trim().split(/\s+/).filter(Boolean);
  return (parts.length > 1 ? parts[0][0] + parts[parts.length - 1][0] : (parts[0] ?? '?').slice(0, 2)).toUpperCase();
}

/** A page below a section (a run below Runs) lights up its section in the navigation. */
function selectedNavKey(pathname: string, campaignId: string | undefined): string {
  if (campaignId) {
    const runs = paths.campaignRuns.getHref(campaignId);
    if (pathname.startsWith(`${runs}/`)) return runs;
  }
  return pathname;
}

export function AppShell({ campaignSwitcher, children }: AppShellProps) {
  const navigate = useNavigate();
  const location = useLocation();
  const user = useUser().data;
  const signOut = useSignOut();
  const [sheetOpen, setSheetOpen] = useState(false);
  const [pageShortcuts, setPageShortcuts] = useState<ShortcutEntry[]>([]);
  const campaignMatch = useMatch('/campaigns/:campaignId/*');
  const campaignId = campaignMatch?.params.campaignId;

  const shortcuts = useMemo<Shortcut[]>(() => {
    const list: Shortcut[] = [
      { keys: ['?'], group: 'General', description: 'Show this list of shortcuts', run: () => setSheetOpen(true) },
      { keys: ['g', 'c'], group: 'Go to', description: 'Campaigns', run: () => navigate(paths.campaigns.getHref()) },
      { keys: ['g', 'p'], group: 'Go to', description: 'Your account (profile)', run: () => navigate(paths.account.getHref()) },
    ];
    if (campaignId) {
      list.push(
        { keys: ['g', 'o'], group: 'Current campaign', description: 'Overview', run: () => navigate(paths.campaign.getHref(campaignId)) },
        { keys: ['g', 'r'], group: 'Current campaign', description: 'Runs', run: () => navigate(paths.campaignRuns.getHref(campaignId)) },
        { keys: ['g', 'h'], group: 'Current campaign', description: 'Channels', run: () => navigate(paths.campaignChannels.getHref(campaignId)) },
        { keys: ['g', 'm'], group: 'Current campaign', description: 'Members', run: () => navigate(paths.campaignMembers.getHref(campaignId)) },
        { keys: ['g', 't'], group: 'Current campaign', description: 'Audit trail', run: () => navigate(paths.campaignAudit.getHref(campaignId)) },
      );
    }
    if (user?.isAdmin) {
      list.push(
        { keys: ['g', 'e'], group: 'Administration', description: 'Captured e-mail', run: () => navigate(paths.adminMail.getHref()) },
        { keys: ['g', 'u'], group: 'Administration', description: 'User accounts', run: () => navigate(paths.adminUsers.getHref()) },
      );
    }
    return list;
  }, [campaignId, navigate, user?.isAdmin]);

  const bindings = useMemo<KeyBinding[]>(() => shortcuts.map(({ keys, run }) => ({ keys, run })), [shortcuts]);
  useKeySequences(bindings, !sheetOpen);

  const userMenu: MenuProps['items'] = [
    { key: 'who', type: 'group', label: user ? `${user.name} · ${user.email}` : '' },
    { key: 'account', icon: <UserOutlined />, label: 'Account' },
    ...(user?.isAdmin
      ? ([
          { type: 'divider' },
          { key: 'admin-mail', icon: <MailOutlined />, label: 'Captured e-mail' },
          { key: 'admin-users', icon: <SafetyCertificateOutlined />, label: 'User accounts' },
        ] satisfies MenuProps['items'])
      : []),
    { type: 'divider' },
    { key: 'shortcuts', icon: <QuestionCircleOutlined />, label: 'Keyboard shortcuts (?)' },
    { key: 'sign-out', icon: <LogoutOutlined />, label: 'Sign out', danger: true },
  ];

  const onUserMenu: MenuProps['onClick'] = ({ key }) => {
    if (key === 'account') navigate(paths.account.getHref());
    else if (key === 'admin-mail') navigate(paths.adminMail.getHref());
    else if (key === 'admin-users') navigate(paths.adminUsers.getHref());
    else if (key === 'shortcuts') setSheetOpen(true);
    else if (key === 'sign-out') void signOut();
  };

  const navItems: MenuProps['items'] = [
    { key: paths.campaigns.getHref(), icon: <UnorderedListOutlined />, label: <Link to={paths.campaigns.getHref()}>All campaigns</Link> },
    ...(campaignId
      ? ([
          {
            key: 'campaign',
            type: 'group',
            label: 'This campaign',
            children: [
              { key: paths.campaign.getHref(campaignId), icon: <DashboardOutlined />, label: <Link to={paths.campaign.getHref(campaignId)}>Overview</Link> },
              { key: paths.campaignRuns.getHref(campaignId), icon: <VideoCameraOutlined />, label: <Link to={paths.campaignRuns.getHref(campaignId)}>Runs</Link> },
              { key: paths.campaignChannels.getHref(campaignId), icon: <DashboardFilled />, label: <Link to={paths.campaignChannels.getHref(campaignId)}>Channels</Link> },
              { key: paths.campaignMembers.getHref(campaignId), icon: <TeamOutlined />, label: <Link to={paths.campaignMembers.getHref(campaignId)}>Members</Link> },
              { key: paths.campaignAudit.getHref(campaignId), icon: <AuditOutlined />, label: <Link to={paths.campaignAudit.getHref(campaignId)}>Audit trail</Link> },
            ],
          },
        ] satisfies MenuProps['items'])
      : []),
    ...(user?.isAdmin
      ? ([
          {
            key: 'admin',
            type: 'group',
            label: 'Administration',
            children: [
              { key: paths.adminMail.getHref(), icon: <MailOutlined />, label: <Link to={paths.adminMail.getHref()}>Captured e-mail</Link> },
              { key: paths.adminUsers.getHref(), icon: <SafetyCertificateOutlined />, label: <Link to={paths.adminUsers.getHref()}>User accounts</Link> },
            ],
          },
        ] satisfies MenuProps['items'])
      : []),
  ];

  return (
    <Layout className="app-shell">
      <Layout.Header className="app-header">
        <BrandMark />
        <div className="app-header-switcher">{campaignSwitcher}</div>
        <div className="app-header-end">
          <Tooltip title="Keyboard shortcuts (?)">
            <Button type="text" icon={<QuestionCircleOutlined />} aria-label="Keyboard shortcuts" onClick={() => setSheetOpen(true)} />
          </Tooltip>
          <Dropdown menu={{ items: userMenu, onClick: onUserMenu }} trigger={['click']} placement="bottomRight">
            <Button type="text" className="user-menu-button" aria-label="User menu">
              <Avatar size={26} className="user-avatar">
                {user ? initials(user.name) : '?'}
              </Avatar>
              <Typography.Text className="user-menu-name">{user?.name}</Typography.Text>
            </Button>
          </Dropdown>
        </div>
      </Layout.Header>
      <Layout>
        <Layout.Sider width={212} className="app-sider" breakpoint="md" collapsedWidth={0} theme="light">
          <nav aria-label="Main">
            <Menu mode="inline" selectedKeys={[selectedNavKey(location.pathname, campaignId)]} items={navItems} className="app-nav" />
          </nav>
        </Layout.Sider>
        <Layout.Content className="app-content">
          <div className="app-content-inner">
            <PageShortcutsProvider suspended={sheetOpen} onChange={setPageShortcuts}>
              {children ?? <Outlet />}
            </PageShortcutsProvider>
          </div>
        </Layout.Content>
      </Layout>
      <ShortcutSheet open={sheetOpen} onClose={() => setSheetOpen(false)} shortcuts={[...shortcuts, ...pageShortcuts]} />
    </Layout>
  );
}
