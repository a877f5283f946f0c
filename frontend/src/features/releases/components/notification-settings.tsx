import { App, Skeleton, Switch, Typography } from 'antd';
import { NOTIFICATION_KINDS, NOTIFICATION_LABELS, type NotificationKind, type NotificationSettings as Settings } from '@dialsheet/common';
import { ErrorState } from '@/components/feedback/error-state';
import { useNotificationSettings } from '../api/get-notification-settings';
import { useUpdateNotificationSettings } from '../api/update-notification-settings';
import './releases.css';

/** A switch per kind of e-mail, saved the moment it is switched. */
export function NotificationSettings() {
  const { message } = App.useApp();
  const settings = useNotificationSettings();
  const update = useUpdateNotificationSettings();

  if (settings.isPending) return <Skeleton active paragraph={{ rows: 3 }} />;
  if (settings.isError) return <ErrorState error={settings.error} onRetry={() => void settings.refetch()} />;

  const toggle = (kind: NotificationKind, enabled: boolean) => {
    const next: Settings = { ...settings.data, [kind]: enabled };
    update.mutate(next, {
      onSuccess: () => void message.success(`${enabled ? 'On' : 'Off'}: ${NOTIFICATION_LABELS[kind].toLowerCase()}`),
    });
  };

  return (
    <div className="notification-list">
      <Typography.Paragraph type="secondary">E-mails Dialsheet sends you. Each switch is saved at once.</Typography.Paragraph>
      {NOTIFICATION_KINDS.map((kind) => (
        <label key={kind} className="notification-item">
          <Switch
            size="small"
            checked={settings.data[kind] ?? false}
            loading={update.isPending && update.variables?.[kind] !== settings.data[kind]}
            disabled={update.isPending}
            onChange={(checked) => toggle(kind, checked)}
            aria-label={NOTIFICATION_LABELS[kind]}
          />
          <span>{NOTIFICATION_LABELS[kind]}</span>
        </label>
      ))}
    </div>
  );
}
