import { useQueryClient } from '@tanstack/react-query';
import { useCallback, useSyncExternalStore } from 'react';
import { endSession, getToken, subscribeToSession } from '@/lib/session';

/** The current bearer token (or null), re-rendering on sign-in and sign-out in any tab. */
export function useToken(): string | null {
  return useSyncExternalStore(subscribeToSession, getToken, () => null);
}

/** Sign-out is client-side: drop the token and everything cached for this person. */
export function useSignOut() {
  const queryClient = useQueryClient();
  return useCallback(() => {
    endSession('signed-out');
    queryClient.clear();
  }, [queryClient]);
}
