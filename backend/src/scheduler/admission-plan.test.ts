import { describe, expect, it } from 'vitest';
import { planAdmission, type AdmissionCandidate } from './admission-plan';

const runsOf = (owner: string, n: number): AdmissionCandidate[] => Array.from({ length: n }, (_, i) => ({ id: `${owner}-${i}`, ownerId: owner }));

describe('fair admission', () => {
  it('shares free slots equally between owners, whoever submitted first', () => {
    const plan = planAdmission({
      freeSlots: 4,
      poolSlots: 4,
      inFlight: new Map(),
      slotCap: () => 10,
      candidates: [...runsOf('ada', 10), ...runsOf('ben', 10)],
    });
    expect(plan.admit).toEqual(['ada-0', 'ben-0', 'ada-1', 'ben-1']);
  });

  it('lets the owner with fewest runs in flight go first', () => {
    const plan = planAdmission({
      freeSlots: 2,
      poolSlots: 6,
      inFlight: new Map([['ada', 3], ['ben', 1]]),
      slotCap: () => 10,
      candidates: [...runsOf('ada', 3), ...runsOf('ben', 3)],
    });
    expect(plan.admit).toEqual(['ben-0', 'ben-1']);
  });

  it('never admits past an owner\'s slot cap, and says so', () => {
    const plan = planAdmission({
      freeSlots: 8,
      poolSlots: 8,
      inFlight: new Map([['ada', 1]]),
      slotCap: () => 3,
      candidates: runsOf('ada', 5),
    });
    expect(plan.admit).toEqual(['ada-0', 'ada-1']);
    expect(plan.waiting.get('ada-2')).toBe('waiting for quota: 3 of 3 slots in use');
  });

  it('keeps an owner\'s own order (priority, then age) and explains a busy or empty pool', () => {
    const busy = planAdmission({ freeSlots: 1, poolSlots: 2, inFlight: new Map(), slotCap: () => 5, candidates: runsOf('ada', 3) });
    expect(busy.admit).toEqual(['ada-0']);
    expect(busy.waiting.get('ada-1')).toBe('waiting for a free worker slot: all 2 slots of the pool are busy');
    const empty = planAdmission({ freeSlots: 0, poolSlots: 0, inFlight: new Map(), slotCap: () => 5, candidates: runsOf('ada', 1) });
    expect(empty.admit).toEqual([]);
    expect(empty.waiting.get('ada-0')).toMatch(/no worker host is running/);
  });
});

describe('admission against CPU-hour budgets', () => {
  it('admits nothing for an owner whose monthly CPU-hours are used up, and says why, while others proceed', () => {
    const plan = planAdmission({
      freeSlots: 4,
      poolSlots: 4,
      inFlight: new Map(),
      slotCap: () => 4,
      blockedReason: (owner) => (owner === 'ada' ? 'waiting for quota: monthly CPU-hours used up' : undefined),
      candidates: [...runsOf('ada', 3), ...runsOf('ben', 2)],
    });
    expect(plan.admit).toEqual(['ben-0', 'ben-1']);
    expect(plan.waiting.get('ada-0')).toBe('waiting for quota: monthly CPU-hours used up');
  });
});
