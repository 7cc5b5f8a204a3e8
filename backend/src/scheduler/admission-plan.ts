/** A run that asks for a worker slot. Candidates arrive ordered by priority, then age. */
export interface AdmissionCandidate {
  id: string;
  ownerId: string;
}

export interface AdmissionInput {
  /** Free worker slots in the pool now. */
  freeSlots: number;
  /** Worker slots the pool has in all (alive workers). */
  poolSlots: number;
  /** Runs each owner has in flight (running, or admitted and not yet picked up). */
  inFlight: Map<string, number>;
  /** Concurrent runs an owner may have. */
  slotCap: (ownerId: string) => number;
  /** Why an owner may not start anything now (e.g. monthly CPU-hours used up); undefined when they may. */
  blockedReason?: (ownerId: string) => string | undefined;
  candidates: AdmissionCandidate[];
}

export interface AdmissionPlan {
  admit: string[];
  /** Why each candidate left waiting waits, in words for the person who submitted it. */
  waiting: Map<string, string>;
}

/**
 * Fair admission: while slots are free, the owner with the fewest runs in flight
 * goes next (ties: whose next candidate came first); within an owner, candidates
 * keep their order (priority, then age). Nobody goes past their slot cap.
 */
export function planAdmission(input: AdmissionInput): AdmissionPlan {
  const queues = new Map<string, AdmissionCandidate[]>();
  const firstSeen = new Map<string, number>();
  input.candidates.forEach((candidate, position) => {
    if (!queues.has(candidate.ownerId)) {
      queues.set(candidate.ownerId, []);
      firstSeen.set(candidate.ownerId, position);
    }
    queues.get(candidate.ownerId)!.push(candidate);
  });
  const inFlight = new Map(input.inFlight);
  const used = (owner: string) => inFlight.get(owner) ?? 0;
  const admit: string[] = [];
  let free = input.freeSlots;

  while (free > 0) {
    let next: string | undefined;
    for (const [owner, queue] of queues) {
      if (queue.length === 0 || used(owner) >= input.slotCap(owner) || input.blockedReason?.(owner)) continue;
      if (next === undefined || used(owner) < used(next) || (used(owner) === used(next) && firstSeen.get(owner)! < firstSeen.get(next)!)) {
        next = owner;
      }
    }
    if (next === undefined) break;
    admit.push(queues.get(next)!.shift()!.id);
    inFlight.set(next, used(next) + 1);
    free--;
  }

  const waiting = new Map<string, string>();
  for (const [owner, queue] of queues) {
    const cap = input.slotCap(owner);
    for (const candidate of queue) {
      let reason: string;
      const blocked = input.blockedReason?.(owner);
      if (blocked) reason = blocked;
      else if (used(owner) >= cap) reason = `waiting for quota: ${used(owner)} of ${cap} slots in use`;
      else if (input.poolSlots === 0) reason = 'waiting for a worker: no worker host is running; ask your lab admin';
      else reason = `waiting for a free worker slot: all ${input.poolSlots} slots of the pool are busy`;
      waiting.set(candidate.id, reason);
    }
  }
  return { admit, waiting };
}
