import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';

const root = resolve(__dirname, '../../..');
const command = join(root, 'shared/src/cli/flow-command.ts');
const tsx = join(root, 'node_modules/.bin/tsx');

function flow(spec: unknown, extra: string[] = []) {
  const dir = mkdtempSync(join(tmpdir(), 'kiln-flow-'));
  const file = join(dir, 'spec.json');
  writeFileSync(file, typeof spec === 'string' ? spec : JSON.stringify(spec));
  return spawnSync(tsx, [command, file, ...extra], { encoding: 'utf8', cwd: root });
}

describe('flow command (numerics.md §5)', () => {
  it('runs a spec to its outcome: exactly one JSON object on stdout with the §5 fields', () => {
    const res = flow({
      domain: { kind: 'ball', dim: 2, boundaryAngle: 2 },
      target: { kind: 'sphere' },
      initial: { kind: 'identity' },
      grid: { points: 60 },
      time: { tMax: 20, maxStep: 1 },
    });
    expect(res.status).toBe(0);
    const lines = res.stdout.trim().split('\n');
    expect(lines).toHaveLength(1);
    const out = JSON.parse(lines[0]!);
    for (const key of [
      'outcome',
      'tFinal',
      'steps',
      'gridPoints',
      'energyInitial',
      'energyFinal',
      'tensionFinal',
      'gradMaxFinal',
      'center',
      'symmetry',
      'cpuSeconds',
      'blowup',
    ]) {
      expect(out).toHaveProperty(key);
    }
    expect(out.outcome).toBe('converged');
    expect(out.blowup).toBeNull();
    expect(res.stderr).toMatch(/outcome: converged/);
  });

  it('rejects a bad spec with the field named on stderr and a non-zero exit', () => {
    const res = flow({
      domain: { kind: 'ball', dim: 2 },
      target: { kind: 'sphere' },
      initial: { kind: 'identity' },
      grid: { points: 1e9 },
      time: { tMax: 1 },
    });
    expect(res.status).not.toBe(0);
    expect(res.stdout).toBe('');
    expect(res.stderr).toMatch(/domain\.boundaryAngle/);
    expect(res.stderr).toMatch(/grid\.points must be an integer from 20 to 20000/);
  });

  it('rejects unreadable files and invalid JSON', () => {
    const missing = spawnSync(tsx, [command, join(tmpdir(), 'no-such-kiln-spec.json')], { encoding: 'utf8' });
    expect(missing.status).toBe(2);
    expect(missing.stderr).toMatch(/cannot read/);
    const bad = flow('{ not json');
    expect(bad.status).toBe(2);
    expect(bad.stderr).toMatch(/not valid JSON/);
  });

  it('--dilation-profile adds F(s) = D(h∘γ_s) at the start and the end, for the s values exactly as given', () => {
    // Source: F(s) = 12π² s/(1+s)² for the identity of S³ (derived, numerics.md §4.3); the identity is a steady state.
    const res = flow(
      {
        domain: { kind: 'sphere', dim: 3 },
        target: { kind: 'sphere' },
        initial: { kind: 'identity' },
        grid: { points: 200 },
        time: { tMax: 0.1 },
      },
      ['--dilation-profile', '0.5,2,1e-1'],
    );
    expect(res.status).toBe(0);
    const out = JSON.parse(res.stdout.trim());
    for (const key of ['initial', 'final'] as const) {
      const rows = out.dilationProfile[key] as [number, number][];
      expect(rows.map(([s]) => s)).toEqual([0.5, 2, 0.1]);
      for (const [s, F] of rows) expect(Math.abs(F - (12 * Math.PI ** 2 * s) / (1 + s) ** 2)).toBeLessThan(1e-2);
    }
    const bad = flow({ domain: { kind: 'sphere', dim: 3 }, target: { kind: 'sphere' }, initial: { kind: 'identity' } }, [
      '--dilation-profile',
      '1,-2',
    ]);
    expect(bad.status).toBe(2);
    expect(bad.stderr).toMatch(/positive finite/);
  });

  it('a normalized run adds "recentre" and "sigmaInitial" to the summary', () => {
    // Source: numerics.md §1 (the normalized flow starts from X = 0, after re-centring h₀ → h₀∘γ_s).
    const res = flow({
      domain: { kind: 'sphere', dim: 3 },
      target: { kind: 'sphere' },
      flow: 'normalized',
      initial: { kind: 'perturbed', amplitude: 0.2, mode: 1 },
      grid: { points: 100 },
      time: { tMax: 0.5, maxStep: 0.1 },
    });
    expect(res.status).toBe(0);
    const out = JSON.parse(res.stdout.trim());
    expect(out.symmetry).toBe('none');
    expect(Object.keys(out.recentre).sort()).toEqual(['centerBefore', 'energyAfter', 'energyBefore', 's']);
    expect(out.recentre.s).toBeLessThan(1);
    expect(out.recentre.centerBefore).toBeGreaterThan(1);
    expect(Math.abs(out.center)).toBeLessThan(1e-12);
    expect(typeof out.sigmaInitial).toBe('number');
  });
});
