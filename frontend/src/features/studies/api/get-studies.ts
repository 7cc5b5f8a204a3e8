import type { Study } from '@kiln/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { studyKeys } from './study-keys';

/** `GET /api/studies`: studies the caller belongs to (all of them for lab admins). */
export const getStudies = (signal?: AbortSignal) => api.get<Study[]>('/studies', signal);

export const studiesQueryOptions = () =>
  queryOptions({ queryKey: studyKeys.list(), queryFn: ({ signal }) => getStudies(signal), staleTime: 30_000 });

export const useStudies = () => useQuery(studiesQueryOptions());

/** `GET /api/studies/:id`: a study with its members and the caller's role in it. */
export const getStudy = (studyId: string, signal?: AbortSignal) => api.get<Study>(`/studies/${studyId}`, signal);

export const studyQueryOptions = (studyId: string) =>
  queryOptions({ queryKey: studyKeys.detail(studyId), queryFn: ({ signal }) => getStudy(studyId, signal), staleTime: 30_000 });

export const useStudy = (studyId: string | undefined) =>
  useQuery({ ...studyQueryOptions(studyId ?? ''), enabled: !!studyId });
