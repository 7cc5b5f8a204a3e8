/**
 * Cache keys of the Möbius diagnostics. The parent-checkpoint list deliberately
 * shares its key with the run page's checkpoint list (`['runs','checkpoints',id]`),
 * so both read one cache entry; everything else lives under `['mobius']`.
 */
export const mobiusKeys = {
  all: ['mobius'] as const,
  dilationProfile: (checkpointId: string) => [...mobiusKeys.all, 'dilation-profile', checkpointId] as const,
  runCheckpoints: (runId: string) => ['runs', 'checkpoints', runId] as const,
  runDetail: (runId: string) => ['runs', 'detail', runId] as const,
};
