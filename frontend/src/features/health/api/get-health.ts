import type { HealthResponse } from '@kiln/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api, ApiRequestError } from '@/lib/api-client';

export const healthKeys = {
  all: ['health'] as const,
  current: () => [...healthKeys.all, 'current'] as const,
};

function isHealthResponse(value: unknown): value is HealthResponse {
  return typeof value === 'object' && value !== null && 'db' in value && 'redis' in value && 'workers' in value;
}

/**
 * `GET /api/health` (no auth). A server that reports itself degraded may do so
 * with a 503 and the full health body; that is data to show, not a failure.
 */
export async function getHealth(signal?: AbortSignal): Promise<HealthResponse> {
  try {
    return await api.get<HealthResponse>('/health', signal);
  } catch (error) {
    if (error instanceof ApiRequestError && error.status === 503 && isHealthResponse(error.body)) return error.body;
    throw error;
  }
}

export const healthQueryOptions = () =>
  queryOptions({
    queryKey: healthKeys.current(),
    queryFn: ({ signal }) => getHealth(signal),
    staleTime: 10_000,
    // An instrument panel: keep it current while it is on screen.
    refetchInterval: 30_000,
  });

export const useHealth = () => useQuery(healthQueryOptions());
