import { forkFlowRun as engineForkFlowRun } from '@kiln/shared';
import type { FlowRun, RunSpec } from '@kiln/shared';

/**
 * The engine's `forkFlowRun(parent, spec)` (shared/src/flow/fork-flow-run.ts): the
 * parent checkpoint's state carried onto the fork's own spec (its grid, step size,
 * tolerance, symmetry). An incompatible override (another domain, dimension, boundary
 * angle or target; a flow the engine does not support) throws a `ForkError` whose
 * message names the field, and the run fails with it.
 */
export function forkFlowRun(parent: FlowRun, spec: RunSpec): FlowRun {
  return engineForkFlowRun(parent, spec);
}
