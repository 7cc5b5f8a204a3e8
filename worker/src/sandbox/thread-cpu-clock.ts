import { readFileSync } from 'node:fs';

// CPU time of the calling thread. Node 20 has no `process.threadCpuUsage` (it came in
// Node 23.9) and `process.cpuUsage()` counts every thread of the process, so on Linux
// we read the kernel's per-thread accounting; a synchronous read runs on the calling
// thread, so `/proc/thread-self` is this worker thread.

/** Nanoseconds on CPU from /proc/thread-self/schedstat (field 1), in seconds. */
function fromSchedstat(): number | null {
  const text = readFileSync('/proc/thread-self/schedstat', 'utf8');
  const ns = Number(text.split(' ')[0]);
  return Number.isFinite(ns) ? ns / 1e9 : null;
}

/** utime + stime (fields 14 and 15, clock ticks of 1/100 s) from /proc/thread-self/stat. */
function fromStat(): number | null {
  const text = readFileSync('/proc/thread-self/stat', 'utf8');
  // The command name (field 2) may contain spaces; fields after it are space-separated.
  const fields = text.slice(text.lastIndexOf(')') + 2).split(' ');
  const ticks = Number(fields[11]) + Number(fields[12]);
  return Number.isFinite(ticks) ? ticks / 100 : null;
}

type Reader = () => number | null;

function pickReader(): Reader | null {
  for (const reader of [fromSchedstat, fromStat]) {
    try {
      if (reader() !== null) return reader;
    } catch {
      // Not Linux, or /proc not mounted: try the next one.
    }
  }
  return null;
}

const reader = pickReader();

/** Whether thread CPU time can be measured here (else callers time their compute slices). */
export const threadCpuClockAvailable = reader !== null;

/** CPU seconds used by the calling thread so far, or null where the platform cannot tell. */
export function threadCpuSeconds(): number | null {
  if (reader === null) return null;
  try {
    return reader();
  } catch {
    return null;
  }
}

/**
 * CPU seconds one run uses in this thread, on top of what earlier attempts recorded.
 * Where no thread clock exists it falls back to the wall time of the compute slices
 * it is given through {@link RunCpuMeter.measure} (an over-estimate on a busy host).
 */
export class RunCpuMeter {
  private readonly startedAt = threadCpuSeconds();
  private sliceWallSeconds = 0;

  constructor(private readonly earlierSeconds: number) {}

  measure<T>(compute: () => T): T {
    const start = performance.now();
    try {
      return compute();
    } finally {
      this.sliceWallSeconds += (performance.now() - start) / 1000;
    }
  }

  /** The run's CPU seconds in total (earlier attempts plus this one). */
  total(): number {
    const now = this.startedAt === null ? null : threadCpuSeconds();
    const used = now === null || this.startedAt === null ? this.sliceWallSeconds : now - this.startedAt;
    return this.earlierSeconds + Math.max(0, used);
  }
}
