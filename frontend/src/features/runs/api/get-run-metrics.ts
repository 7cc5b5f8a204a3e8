import type { MetricSample } from '@kiln/shared';
import { queryOptions, useQuery, type QueryClient } from '@tanstack/react-query';
import { api, toQueryString } from '@/lib/api-client';
import { runKeys } from './run-keys';

const PAGE = 5_000;

/** `GET /api/runs/:id/metrics?from=`: samples with step > from, oldest first. */
export const getRunMetrics = (runId: string, from: number, signal?: AbortSignal) =>
  api.get<MetricSample[]>(`/runs/${runId}/metrics${toQueryString({ from, limit: PAGE })}`, signal);

/** Appends samples after the last step already held (events and reads may overlap). */
export function appendSamples(current: MetricSample[] | undefined, incoming: MetricSample[]): MetricSample[] {
  const held = current ?? [];
  const last = held.length ? held[held.length - 1]!.step : -1;
  const fresh = incoming.filter((sample) => sample.step > last).sort((a, b) => a.step - b.step);
  return fresh.length ? [...held, ...fresh] : held;
}

/** Samples that came from the live stream and not (yet) from a read. */
const liveOnly = new WeakSet<MetricSample>();

/**
 * The series is read incrementally: each fetch asks only for samples after the
 * last step read from the server (`from`), so a long run costs one small read per
 * refresh. Live samples (sparse: about one a second) sit in the series until the
 * read that covers their step replaces them.
 */
export const runMetricsQueryOptions = (runId: string, queryClient: QueryClient) =>
  queryOptions({
    queryKey: runKeys.metrics(runId),
    queryFn: async ({ signal }) => {
      const held = queryClient.getQueryData<MetricSample[]>(runKeys.metrics(runId)) ?? [];
      const read = held.filter((sample) => !liveOnly.has(sample));
      let from = read.at(-1)?.step ?? -1;
      for (;;) {
        const page = await getRunMetrics(runId, from, signal);
        read.push(...page.filter((sample) => sample.step > from));
        if (page.length < PAGE) break;
        from = page[page.length - 1]!.step;
      }
      const lastRead = read.at(-1)?.step ?? -1;
      const newerLive = held.filter((sample) => liveOnly.has(sample) && sample.step > lastRead);
      return newerLive.length ? [...read, ...newerLive] : read;
    },
    staleTime: 2_000,
  });

/** Writes a sample from a `progress` event into the cached series. */
export function addLiveSample(queryClient: QueryClient, runId: string, sample: MetricSample): void {
  liveOnly.add(sample);
  queryClient.setQueryData<MetricSample[]>(runKeys.metrics(runId), (current) => appendSamples(current, [sample]));
}

export const useRunMetrics = (runId: string, queryClient: QueryClient, options: { live: boolean }) =>
  useQuery({ ...runMetricsQueryOptions(runId, queryClient), refetchInterval: options.live ? 3_000 : false });
