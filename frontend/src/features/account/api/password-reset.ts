import { useMutation } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

/** `POST /api/auth/password-reset {email}` (public): answers the same whether or not the address has an account. */
export const requestPasswordReset = (email: string) => api.post<unknown>('/auth/password-reset', { email });

/** `POST /api/auth/password-reset/confirm {token, password}` (public). */
export const confirmPasswordReset = (token: string, password: string) => api.post<unknown>('/auth/password-reset/confirm', { token, password });

export const useRequestPasswordReset = () => useMutation({ mutationFn: requestPasswordReset });

export const useConfirmPasswordReset = () =>
  useMutation({ mutationFn: ({ token, password }: { token: string; password: string }) => confirmPasswordReset(token, password) });
