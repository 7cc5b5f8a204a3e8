/** Why the main process aborted a running job's signal (the sandbox reads `signal.reason`). */
export enum AbortReason {
  /** Graceful shutdown of the worker process: checkpoint and hand the run back. */
  Shutdown = 'shutdown',
  /** A pause or cancel was announced for the run: re-read `control_request`. */
  Control = 'control',
}
