import { describe, expect, it } from 'vitest';
import { estimateBlowup } from './blowup-fit';
import type { HistoryRow } from './flow-history';

function row(t: number, grad: number, tension: number): HistoryRow {
  return { tHi: t, tLo: 0, logGrad: Math.log(grad), tension, energy: 1, dt: 1e-3, gradAt: 0 };
}

// Synthetic histories with known laws (the inputs are the outside facts here).
describe('blow-up fit on synthetic histories (numerics.md §3)', () => {
  it('recovers T and p of a power law G = C (T − t)^(−p)', () => {
    for (const p of [0.5, 1.1]) {
      const T = 0.37;
      const rows: HistoryRow[] = [];
      for (let k = 0; k < 120; k++) {
        const tail = 0.1 * Math.pow(10, -k / 20);
        rows.push(row(T - tail, 2 * Math.pow(tail, -p), Math.pow(tail, -p)));
      }
      const e = estimateBlowup(rows);
      expect(e.exponent!).toBeCloseTo(p, 6);
      expect(e.T!).toBeCloseTo(T, 9);
      expect(e.kind).toBe(p === 0.5 ? 'type-I' : 'type-II');
    }
  });

  it('exponential growth in t is infinite-time, with no T and no power-law exponent', () => {
    const rows: HistoryRow[] = [];
    for (let k = 0; k < 100; k++) rows.push(row(k * 0.1, Math.exp(0.8 * k * 0.1), 1));
    const e = estimateBlowup(rows);
    expect(e.kind).toBe('infinite-time');
    expect(e.T).toBeNull();
    expect(e.exponent).toBeNull();
    expect(e.evidence.exponentialRate!).toBeCloseTo(0.8, 8);
  });

  it('the steep-steady-state look-alike (tension falling, gradient levelling off) is not called a blow-up', () => {
    const rows: HistoryRow[] = [];
    for (let k = 0; k < 100; k++) {
      const t = k * 0.2;
      rows.push(row(t, 1e4 * (1 - 0.999 * Math.exp(-t)), Math.exp(-2 * t)));
    }
    const e = estimateBlowup(rows);
    expect(e.kind).toBe('inconclusive');
    expect(e.evidence.notes.join(' ')).toMatch(/steep steady state/);
  });
});
