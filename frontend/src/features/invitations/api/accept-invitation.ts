import type { AcceptInvitationRequest, InvitationPreview, LoginResponse } from '@kiln/shared';
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { startSession } from '@/lib/session';
import { invitationKeys } from './invitation-keys';

/** `GET /api/invitations/preview?token=` (public): what the link opens. */
export const getInvitationPreview = (token: string, signal?: AbortSignal) =>
  api.get<InvitationPreview>(`/invitations/preview?token=${encodeURIComponent(token)}`, signal);

export const invitationPreviewQueryOptions = (token: string) =>
  queryOptions({
    queryKey: invitationKeys.preview(token),
    queryFn: ({ signal }) => getInvitationPreview(token, signal),
    // A used or expired link will not heal on a retry.
    retry: false,
    staleTime: 60_000,
  });

export const useInvitationPreview = (token: string) => useQuery({ ...invitationPreviewQueryOptions(token), enabled: !!token });

/** `POST /api/invitations/accept` (public): a new collaborator account with the chosen name and password; signs in. */
export const acceptInvitation = (body: AcceptInvitationRequest) => api.post<LoginResponse>('/invitations/accept', body);

/** `POST /api/invitations/accept-signed-in`: joins the study as the signed-in person the invitation names. */
export const acceptInvitationSignedIn = (token: string) => api.post<{ studyId: string }>('/invitations/accept-signed-in', { token });

export function useAcceptInvitation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: acceptInvitation,
    onSuccess: (response) => {
      // Signed in as the new person, exactly as the sign-in page does it.
      queryClient.clear();
      startSession(response.accessToken);
      queryClient.setQueryData(['auth', 'me'], response.user);
    },
  });
}

export function useAcceptInvitationSignedIn() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: acceptInvitationSignedIn,
    onSuccess: () => void queryClient.invalidateQueries({ queryKey: ['studies'] }),
  });
}
