import { useEffect, useState, type ReactNode } from 'react';
import { App as AntApp, ConfigProvider } from 'antd';
import enGB from 'antd/locale/en_GB';
import { QueryClientProvider, type QueryClient } from '@tanstack/react-query';
import { createQueryClient } from '@/lib/query-client';
import { setApiErrorNotifier } from '@/lib/api-client';
import { theme } from './theme';

/** Hands the API client antd's notification API (themed, inside the App context). */
function ApiErrorNotifications() {
  const { notification } = AntApp.useApp();
  useEffect(() => {
    setApiErrorNotifier((message, status) => {
      notification.error({
        title: status === 403 ? 'Not allowed' : status === 409 ? 'Not possible right now' : 'That did not work',
        description: message,
        placement: 'bottomRight',
        duration: 6,
      });
    });
    return () => setApiErrorNotifier(null);
  }, [notification]);
  return null;
}

interface AppProviderProps {
  children: ReactNode;
  /** Tests pass their own client so each test starts with an empty cache. */
  queryClient?: QueryClient;
}

export function AppProvider({ children, queryClient }: AppProviderProps) {
  const [client] = useState(() => queryClient ?? createQueryClient());
  return (
    <ConfigProvider theme={theme} locale={enGB} componentSize="middle">
      <AntApp className="app-root">
        <ApiErrorNotifications />
        <QueryClientProvider client={client}>{children}</QueryClientProvider>
      </AntApp>
    </ConfigProvider>
  );
}
