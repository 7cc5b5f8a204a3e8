import type { Invitation } from '@kiln/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { invitationKeys } from './invitation-keys';

/** `GET /api/studies/:id/invitations` (the study's owner and lab admins). */
export const getStudyInvitations = (studyId: string, signal?: AbortSignal) =>
  api.get<Invitation[]>(`/studies/${studyId}/invitations`, signal);

export const studyInvitationsQueryOptions = (studyId: string) =>
  queryOptions({
    queryKey: invitationKeys.study(studyId),
    queryFn: ({ signal }) => getStudyInvitations(studyId, signal),
    staleTime: 10_000,
  });

export const useStudyInvitations = (studyId: string, enabled = true) =>
  useQuery({ ...studyInvitationsQueryOptions(studyId), enabled });
