import * as engine from '@kiln/shared';
import type { FlowRun, RunSpec } from '@kiln/shared';

type ForkFlowRun = (parent: FlowRun, spec: RunSpec) => FlowRun;

/**
 * The engine's `forkFlowRun(parent, spec)`: the parent checkpoint's state carried
 * onto the fork's own spec (its grid, step size, flow). Looked up at run time so the
 * worker builds against an engine that does not export it yet; a fork then fails
 * with a message that says so instead of starting from the wrong state.
 */
export function forkFlowRun(parent: FlowRun, spec: RunSpec): FlowRun {
  const fork = (engine as unknown as { forkFlowRun?: ForkFlowRun }).forkFlowRun;
  if (typeof fork !== 'function') {
    throw new Error('forking is not available in this engine build yet (the engine does not export forkFlowRun)');
  }
  return fork(parent, spec);
}
