import { QueryClientProvider } from '@tanstack/react-query';
import { App as AntApp, ConfigProvider } from 'antd';
import enGB from 'antd/locale/en_GB';
import { useEffect, type ReactNode } from 'react';
import { AppErrorBoundary } from '@/components/app-error-boundary';
import { getToken, subscribeToSession } from '@/lib/session';
import { queryClient } from './query-client';
import { kilnTheme } from './theme';

/** Everything the app needs around it: theme, antd's App (message/notification), the query cache. */
export function AppProvider({ children }: { children: ReactNode }) {
  // Whenever the session ends (sign-out, a 401, another tab), forget everything
  // cached for the person who was signed in.
  useEffect(
    () =>
      subscribeToSession(() => {
        if (getToken() === null) queryClient.clear();
      }),
    [],
  );

  return (
    <ConfigProvider theme={kilnTheme} locale={enGB}>
      <AntApp>
        <AppErrorBoundary>
          <QueryClientProvider client={queryClient}>{children}</QueryClientProvider>
        </AppErrorBoundary>
      </AntApp>
    </ConfigProvider>
  );
}
