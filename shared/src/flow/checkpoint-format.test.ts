import { describe, expect, it } from 'vitest';
import { parseRunSpec, type RunSpecInput } from '../spec';
import { advanceFlowRun, createFlowRun, SCALAR_NAMES, type FlowRun } from './flow-run';
import { CheckpointError, crc32, deserializeCheckpoint, serializeCheckpoint } from './checkpoint-format';
import { summarizeFlowRun } from './flow-summary';

// A blow-up run: refinement (regrids) happens both before and after the checkpoint.
const spec: RunSpecInput = {
  domain: { kind: 'ball', dim: 3, boundaryAngle: 2 * Math.PI },
  target: { kind: 'sphere' },
  initial: { kind: 'identity' },
  grid: { points: 80 },
  time: { tMax: 1, maxStep: 0.01 },
  stop: { gradientBound: 1e6 },
};

function bits(a: Float64Array): string {
  return Buffer.from(a.buffer, a.byteOffset, a.byteLength).toString('hex');
}

function expectIdentical(a: FlowRun, b: FlowRun): void {
  for (const k of SCALAR_NAMES) expect(Object.is(a.s[k], b.s[k]), `scalar ${k}`).toBe(true);
  expect(bits(a.r)).toBe(bits(b.r));
  expect(bits(a.h)).toBe(bits(b.h));
  expect(bits(a.history)).toBe(bits(b.history));
  expect(JSON.stringify(summarizeFlowRun(a))).toBe(JSON.stringify(summarizeFlowRun(b)));
}

describe('checkpoint format (numerics.md §2 "Deterministic")', () => {
  it('CRC-32 matches the standard check value', () => {
    // Source: CRC-32/ISO-HDLC check value of "123456789" is 0xCBF43926 (classical catalogue value, from memory).
    expect(crc32(new TextEncoder().encode('123456789'))).toBe(0xcbf43926);
  });

  it('resuming from a mid-run checkpoint is bit-identical to the uninterrupted run', () => {
    const straight = createFlowRun(parseRunSpec(spec));
    advanceFlowRun(straight);
    expect(straight.s.regrids).toBeGreaterThan(3);

    const first = createFlowRun(parseRunSpec(spec));
    advanceFlowRun(first, { maxSteps: 120 });
    const regridsBefore = first.s.regrids;
    const bytes = serializeCheckpoint(first);
    const resumed = deserializeCheckpoint(bytes.slice());
    // Serializing the restored run gives the same bytes.
    expect(Buffer.from(serializeCheckpoint(resumed)).equals(Buffer.from(bytes))).toBe(true);
    advanceFlowRun(resumed);
    expect(resumed.s.regrids).toBeGreaterThan(regridsBefore);
    expectIdentical(straight, resumed);
  });

  it('results do not depend on how the run is cut into slices', () => {
    const straight = createFlowRun(parseRunSpec(spec));
    advanceFlowRun(straight);
    let sliced = createFlowRun(parseRunSpec(spec));
    let calls = 0;
    for (;;) {
      let k = 0;
      const res = advanceFlowRun(sliced, { shouldStop: () => ++k > 7 });
      calls++;
      if (res.done) break;
      if (calls % 10 === 0) sliced = deserializeCheckpoint(serializeCheckpoint(sliced));
    }
    expect(calls).toBeGreaterThan(10);
    expectIdentical(straight, sliced);
  });

  it('a CPU budget ends the run with time-limit, and a larger budget resumes it', () => {
    const run = createFlowRun(parseRunSpec(spec));
    let used = 0;
    const res = advanceFlowRun(run, { cpuSecondsUsed: () => (used += 0.01), cpuBudgetSeconds: 0.2 });
    expect(res.outcome).toBe('time-limit');
    expect(res.reason).toBe('cpu-budget');
    const restored = deserializeCheckpoint(serializeCheckpoint(run));
    const more = advanceFlowRun(restored, { cpuSecondsUsed: 0.2, cpuBudgetSeconds: 100 });
    expect(more.outcome).toBe('blowup');
  });

  it('refuses corrupted, truncated and wrong-version checkpoints with a clear error', () => {
    const run = createFlowRun(parseRunSpec(spec));
    advanceFlowRun(run, { maxSteps: 50 });
    const good = serializeCheckpoint(run);

    const flipped = good.slice();
    flipped[Math.floor(flipped.length / 2)]! ^= 0x10;
    expect(() => deserializeCheckpoint(flipped)).toThrow(CheckpointError);
    expect(() => deserializeCheckpoint(flipped)).toThrow(/corrupted: CRC-32/);

    expect(() => deserializeCheckpoint(good.slice(0, good.length - 100))).toThrow(/truncated/);
    expect(() => deserializeCheckpoint(good.slice(0, 20))).toThrow(/truncated/);

    const wrongMagic = good.slice();
    wrongMagic[0] = 0x58;
    expect(() => deserializeCheckpoint(wrongMagic)).toThrow(/magic/);

    const v9 = good.slice();
    new DataView(v9.buffer).setUint32(8, 9, true);
    expect(() => deserializeCheckpoint(v9)).toThrow(/unsupported checkpoint version 9/);
  });
});
