import { useCallback, useSyncExternalStore, type ReactNode } from 'react';
import { Navigate, useLocation, useNavigate } from 'react-router-dom';
import { queryOptions, useQuery, useQueryClient } from '@tanstack/react-query';
import type { LoginResponse, User } from '@dialsheet/common';
import { paths } from '@/config/paths';
import { PageLoader } from '@/components/feedback/page-loader';
import { ErrorState } from '@/components/feedback/error-state';
import { api } from './api-client';
import { authToken, type SessionEndReason } from './auth-token';

export { authToken, type SessionEndReason };

/** The current access token; re-renders when it is set or cleared. */
export function useAccessToken(): string | null {
  return useSyncExternalStore(authToken.subscribe, authToken.get, authToken.get);
}

export const getMe = (): Promise<User> => api.get<User>('/auth/me');

export const userQueryKey = ['auth', 'me'] as const;

export const getUserQueryOptions = () => queryOptions({ queryKey: userQueryKey, queryFn: getMe });

/** The signed-in person, or undefined while loading / signed out. */
export function useUser() {
  const token = useAccessToken();
  return useQuery({ ...getUserQueryOptions(), enabled: token !== null });
}

/** Keeps the token and primes the current-user cache from a sign-in or invitation acceptance. */
export function useStartSession() {
  const queryClient = useQueryClient();
  return useCallback(
    (session: LoginResponse) => {
      queryClient.clear();
      queryClient.setQueryData(userQueryKey, session.user);
      authToken.set(session.accessToken);
    },
    [queryClient],
  );
}

interface SignOutOptions {
  /** Shown on the sign-in page; "signed-out" shows nothing. */
  reason?: SessionEndReason;
  /** Skip the server call when the token is already dead (e.g. right after a password change). */
  skipServer?: boolean;
}

/** Revokes the token on the server (best effort), forgets it here and goes to the sign-in page. */
export function useSignOut() {
  const queryClient = useQueryClient();
  const navigate = useNavigate();
  return useCallback(
    async ({ reason = 'signed-out', skipServer = false }: SignOutOptions = {}) => {
      if (authToken.get() && !skipServer) {
        // Signing out must work even when the server is unreachable or the token already expired.
        await api.post('/auth/logout', undefined, { notify: false }).catch(() => undefined);
      }
      authToken.clear(reason);
      queryClient.clear();
      navigate(paths.signIn.getHref(), { replace: true });
    },
    [navigate, queryClient],
  );
}

/** Renders its children only for a signed-in person; otherwise sends them to sign in and back. */
export function ProtectedRoute({ children }: { children: ReactNode }) {
  const token = useAccessToken();
  const location = useLocation();
  const user = useUser();

  if (!token) {
    const next = `${location.pathname}${location.search}`;
    return <Navigate to={paths.signIn.getHref(next)} replace />;
  }
  if (user.isPending) return <PageLoader label="Loading your account" />;
  if (user.isError) return <ErrorState error={user.error} onRetry={() => void user.refetch()} />;
  return <>{children}</>;
}

/** Platform-administrator pages: anyone else sees a plain refusal. */
export function AdminRoute({ children }: { children: ReactNode }) {
  const user = useUser();
  if (!user.data?.isAdmin) {
    return (
      <ErrorState
        title="Administrators only"
        description="This page is for the platform administrator. Ask them if you need something changed."
      />
    );
  }
  return <>{children}</>;
}
