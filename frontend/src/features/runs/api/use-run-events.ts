import type { Run, RunEvent } from '@kiln/shared';
import { useQueryClient } from '@tanstack/react-query';
import { useEffect, useState } from 'react';
import { api } from '@/lib/api-client';
import { addLiveSample } from './get-run-metrics';
import { runKeys } from './run-keys';

export type LiveStatus = 'off' | 'connecting' | 'live' | 'reconnecting';

/** `POST /api/runs/:id/events/ticket`: a 60-second, run-scoped ticket for EventSource. */
const getEventTicket = (runId: string) => api.post<{ ticket: string; expiresIn: number }>(`/runs/${runId}/events/ticket`);

/**
 * Follows a run's server-sent events while `enabled`, writing each event into the
 * query cache with setQueryData (stack-notes §3.6): progress into the run and its
 * metric series, state changes into the run (then a fresh read), checkpoints into
 * the checkpoint list. On an error the stream is closed and reopened with a new
 * ticket (tickets live 60 s), backing off up to 10 s.
 */
export function useRunEvents(runId: string, enabled: boolean): LiveStatus {
  const queryClient = useQueryClient();
  const [status, setStatus] = useState<LiveStatus>('off');

  useEffect(() => {
    if (!enabled) {
      setStatus('off');
      return;
    }
    let source: EventSource | null = null;
    let retry: ReturnType<typeof setTimeout> | undefined;
    let stopped = false;
    let failures = 0;

    const onEvent = (event: RunEvent) => {
      switch (event.type) {
        case 'progress':
          queryClient.setQueryData<Run>(runKeys.detail(runId), (run) =>
            run ? { ...run, progress: event.sample, cpuSeconds: event.cpuSeconds } : run,
          );
          addLiveSample(queryClient, runId, event.sample);
          break;
        case 'state':
          queryClient.setQueryData<Run>(runKeys.detail(runId), (run) =>
            run ? { ...run, state: event.state, outcome: event.outcome, waitReason: event.waitReason } : run,
          );
          void queryClient.invalidateQueries({ queryKey: runKeys.detail(runId) });
          void queryClient.invalidateQueries({ queryKey: runKeys.metrics(runId) });
          void queryClient.invalidateQueries({ queryKey: runKeys.checkpoints(runId) });
          void queryClient.invalidateQueries({ queryKey: ['sweeps'] });
          break;
        case 'checkpoint':
          void queryClient.invalidateQueries({ queryKey: runKeys.checkpoints(runId) });
          break;
      }
    };

    const open = async () => {
      if (stopped) return;
      setStatus(failures === 0 ? 'connecting' : 'reconnecting');
      try {
        const { ticket } = await getEventTicket(runId);
        if (stopped) return;
        source = new EventSource(`/api/runs/${runId}/events?ticket=${encodeURIComponent(ticket)}`);
        source.onopen = () => {
          failures = 0;
          setStatus('live');
        };
        source.onmessage = (message) => {
          try {
            const data = JSON.parse(message.data as string) as RunEvent | { type: 'ping' };
            if (data.type !== 'ping' && 'runId' in data && data.runId === runId) onEvent(data);
          } catch {
            // A malformed message is skipped; the next read fills any gap.
          }
        };
        source.onerror = () => {
          source?.close();
          source = null;
          scheduleRetry();
        };
      } catch {
        scheduleRetry();
      }
    };

    const scheduleRetry = () => {
      if (stopped) return;
      failures += 1;
      setStatus('reconnecting');
      retry = setTimeout(() => void open(), Math.min(10_000, 1_000 * failures));
    };

    void open();
    return () => {
      stopped = true;
      clearTimeout(retry);
      source?.close();
    };
  }, [runId, enabled, queryClient]);

  return status;
}
