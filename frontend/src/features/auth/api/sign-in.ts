import type { LoginRequest, LoginResponse } from '@kiln/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { startSession } from '@/lib/session';
import { authKeys } from './get-me';

/** `POST /api/auth/login`. */
export const signIn = (body: LoginRequest) => api.post<LoginResponse>('/auth/login', body);

/** Signs in, stores the token and seeds the `me` query so the shell needs no second round trip. */
export function useSignIn() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    onSuccess: (response) => {
      queryClient.clear();
      startSession(response.accessToken);
      queryClient.setQueryData(authKeys.me(), response.user);
    },
  });
}
