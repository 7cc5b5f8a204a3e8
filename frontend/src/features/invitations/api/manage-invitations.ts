import type { CreateInvitationRequest, Invitation } from '@kiln/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api, apiRequest } from '@/lib/api-client';
import { invitationKeys } from './invitation-keys';

/** `POST /api/studies/:id/invitations {email, role}`: mails a one-time link that expires. */
export const createInvitation = (studyId: string, body: CreateInvitationRequest) =>
  api.post<Invitation>(`/studies/${studyId}/invitations`, body);

/** `POST /api/invitations/:id/resend`: a fresh link (the old one stops working). */
export const resendInvitation = (invitationId: string) => api.post<Invitation>(`/invitations/${invitationId}/resend`);

/** `DELETE /api/invitations/:id`: the link stops working. */
export const revokeInvitation = (invitationId: string) => apiRequest<void>(`/invitations/${invitationId}`, { method: 'DELETE' });

function useInvalidateStudy(studyId: string) {
  const queryClient = useQueryClient();
  return () => void queryClient.invalidateQueries({ queryKey: invitationKeys.study(studyId) });
}

export function useCreateInvitation(studyId: string) {
  const invalidate = useInvalidateStudy(studyId);
  return useMutation({ mutationFn: (body: CreateInvitationRequest) => createInvitation(studyId, body), onSuccess: invalidate });
}

export function useResendInvitation(studyId: string) {
  const invalidate = useInvalidateStudy(studyId);
  return useMutation({ mutationFn: resendInvitation, onSuccess: invalidate });
}

export function useRevokeInvitation(studyId: string) {
  const invalidate = useInvalidateStudy(studyId);
  return useMutation({ mutationFn: revokeInvitation, onSuccess: invalidate });
}
