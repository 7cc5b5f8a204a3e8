// `npm run bench:flow`: throughput of the flow engine and time-to-outcome of three
// reference runs (issue 3). Each reference run executes in a child process so its
// peak memory (max RSS) is its own. Figures go to stdout as Markdown tables.
import { spawnSync } from 'node:child_process';
import { parseRunSpec, type RunSpecInput } from '../src/spec';
import { advanceFlowRun, createFlowRun, runDiagnostics, summarizeFlowRun } from '../src/flow';

const CASES: Record<string, { title: string; spec: RunSpecInput }> = {
  'ball-2d': {
    title: '(a) ball B² → S², h₀ = 1.5π·r',
    spec: {
      domain: { kind: 'ball', dim: 2, boundaryAngle: 1.5 * Math.PI },
      target: { kind: 'sphere' },
      initial: { kind: 'identity' },
      grid: { points: 200 },
      time: { tMax: 10, maxStep: 0.01 },
      stop: { gradientBound: 1e8 },
    },
  },
  'ellipsoid-steady': {
    title: '(b) S³ → ellipsoid b = 1.5, h₀ = r',
    spec: {
      domain: { kind: 'sphere', dim: 3 },
      target: { kind: 'ellipsoid', axisRatio: 1.5 },
      initial: { kind: 'identity' },
      grid: { points: 400 },
      time: { tMax: 1000, maxStep: 5 },
      stop: { tension: 1e-9 },
    },
  },
  'ball-3d': {
    title: '(c) ball B³ → S³, h₀ = 2π·r',
    spec: {
      domain: { kind: 'ball', dim: 3, boundaryAngle: 2 * Math.PI },
      target: { kind: 'sphere' },
      initial: { kind: 'identity' },
      grid: { points: 200 },
      time: { tMax: 1, maxStep: 0.01 },
      stop: { gradientBound: 1e12 },
    },
  },
};

function cpu(): number {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1e6;
}

/** Runs one reference case in this process and prints one JSON line. */
function runCase(name: string): void {
  const c = CASES[name];
  if (!c) throw new Error(`unknown case ${name}`);
  const rssBefore = process.memoryUsage().rss / 2 ** 20;
  const t0 = cpu();
  const run = createFlowRun(parseRunSpec(c.spec));
  const lambda0 = 1 / run.gradMax;
  advanceFlowRun(run);
  const seconds = cpu() - t0;
  const s = summarizeFlowRun(run, seconds);
  const d = runDiagnostics(run);
  process.stdout.write(
    `${JSON.stringify({
      ...s,
      lambdaInitial: lambda0,
      lambdaFinal: d.lambda,
      newtonIterations: d.newtonIterations,
      rejectedSteps: d.rejectedSteps,
      regrids: d.regrids,
      maxRssMiB: process.resourceUsage().maxRSS / 1024,
      rssBeforeMiB: rssBefore,
    })}\n`,
  );
}

/** Grid-point Newton iterations per CPU second on a smooth run without refinement. */
function throughput(points: number): { steps: number; newton: number; pointIts: number; seconds: number } {
  const make = () => createFlowRun(
    parseRunSpec({
      domain: { kind: 'sphere', dim: 3 },
      target: { kind: 'ellipsoid', axisRatio: 1.5 },
      initial: { kind: 'perturbed', amplitude: 0.3, mode: 2 },
      symmetry: 'none',
      grid: { points },
      // Small steps keep every step doing real Newton work (no convergence, no refinement).
      time: { tMax: 1000, maxStep: 1e-4, tolerance: 1e-8 },
      stop: { tension: 1e-14 },
    }),
  );
  advanceFlowRun(make(), { maxSteps: 50 }); // warm-up (JIT)
  const target = 4e7;
  let steps = 0;
  let newton = 0;
  let pointIts = 0;
  let seconds = 0;
  while (pointIts < target) {
    // Fresh runs from the same start, so every step does the same kind of work.
    const run = make();
    const t0 = cpu();
    advanceFlowRun(run, { maxSteps: 2000, shouldStop: () => run.s.pointIterations >= target - pointIts });
    seconds += cpu() - t0;
    steps += run.s.step;
    newton += run.s.newtonIterations;
    pointIts += run.s.pointIterations;
  }
  return { steps, newton, pointIts, seconds };
}

/**
 * Cost of a step of the normalized flow relative to the standard one (issue 4): the same
 * workload (S³ → ellipsoid b = 1.5, whole sphere, h₀ = r + 0.3 sin r, re-centred for the
 * normalized flow), the same fixed small steps, fresh runs until `seconds` CPU seconds.
 */
function flowCost(flow: 'standard' | 'normalized', points: number, seconds: number) {
  const make = () =>
    createFlowRun(
      parseRunSpec({
        domain: { kind: 'sphere', dim: 3 },
        target: { kind: 'ellipsoid', axisRatio: 1.5 },
        initial: { kind: 'perturbed', amplitude: 0.3, mode: 1 },
        symmetry: 'none',
        flow,
        grid: { points },
        time: { tMax: 1000, maxStep: 1e-4, tolerance: 1e-8 },
        stop: { tension: 1e-14 },
      }),
    );
  advanceFlowRun(make(), { maxSteps: 50 }); // warm-up (JIT)
  let steps = 0;
  let newton = 0;
  let used = 0;
  while (used < seconds) {
    const run = make();
    const t0 = cpu();
    advanceFlowRun(run, { maxSteps: 2000 });
    used += cpu() - t0;
    steps += run.s.step;
    newton += run.s.newtonIterations;
  }
  return { steps, newton, seconds: used };
}

function main(): void {
  const i = process.argv.indexOf('--case');
  if (i >= 0) {
    runCase(process.argv[i + 1]!);
    return;
  }
  console.log('## Throughput (grid-point Newton iterations per CPU second, whole engine)\n');
  console.log('| N | steps | Newton iterations | grid-point iterations | CPU s | M point-its/s | ns per point-iteration |');
  console.log('|---:|---:|---:|---:|---:|---:|---:|');
  for (const n of [200, 1000, 5000]) {
    const r = throughput(n);
    console.log(
      `| ${n} | ${r.steps} | ${r.newton} | ${r.pointIts.toExponential(2)} | ${r.seconds.toFixed(2)} | ${(r.pointIts / r.seconds / 1e6).toFixed(1)} | ${((r.seconds / r.pointIts) * 1e9).toFixed(1)} |`,
    );
  }
  console.log('\n## Normalized flow: cost of a step relative to the standard flow\n');
  console.log('| N | flow | steps | Newton its | CPU s | µs per step | µs per Newton iteration | step cost ratio |');
  console.log('|---:|---|---:|---:|---:|---:|---:|---:|');
  for (const n of [200, 1000]) {
    const a = flowCost('standard', n, 3);
    const b = flowCost('normalized', n, 3);
    const perStep = (r: typeof a) => (r.seconds / r.steps) * 1e6;
    const perIt = (r: typeof a) => (r.seconds / r.newton) * 1e6;
    console.log(`| ${n} | standard | ${a.steps} | ${a.newton} | ${a.seconds.toFixed(2)} | ${perStep(a).toFixed(1)} | ${perIt(a).toFixed(2)} | 1 |`);
    console.log(
      `| ${n} | normalized | ${b.steps} | ${b.newton} | ${b.seconds.toFixed(2)} | ${perStep(b).toFixed(1)} | ${perIt(b).toFixed(2)} | ${(perStep(b) / perStep(a)).toFixed(2)} |`,
    );
  }
  console.log('\n## Time to outcome (each run in its own process)\n');
  console.log('| case | outcome | t_final | steps (rejected) | Newton its | N final | regrids | CPU s | peak RSS MiB (before run) | details |');
  console.log('|---|---|---:|---:|---:|---:|---:|---:|---:|---|');
  for (const [name, c] of Object.entries(CASES)) {
    const child = spawnSync(process.execPath, [...process.execArgv, __filename, '--case', name], {
      encoding: 'utf8',
      maxBuffer: 1 << 24,
    });
    if (child.status !== 0) {
      console.log(`| ${c.title} | failed: ${child.stderr.split('\n')[0]} |`);
      continue;
    }
    const r = JSON.parse(child.stdout.trim().split('\n').pop()!);
    const decades = Math.log10(r.lambdaInitial / r.lambdaFinal);
    let details = `E ${r.energyInitial.toFixed(4)} → ${r.energyFinal.toFixed(6)}, ‖τ‖ ${r.tensionFinal.toExponential(2)}`;
    if (r.blowup) {
      const sqrtEpsT = r.blowup.T ? Math.sqrt(Number.EPSILON * r.blowup.T) : null;
      details =
        `${r.blowup.kind}, p = ${r.blowup.exponent?.toFixed(6)} ± ${r.blowup.exponentUncertainty?.toExponential(1)}, ` +
        `T̂ = ${r.blowup.T?.toPrecision(12)}, λ ${r.lambdaInitial.toExponential(2)} → ${r.lambdaFinal.toExponential(2)} ` +
        `(${decades.toFixed(1)} decades${sqrtEpsT ? `; √(εT) = ${sqrtEpsT.toExponential(2)}` : ''}), confidence ${r.blowup.confidence.toFixed(3)}`;
    }
    console.log(
      `| ${c.title} | ${r.outcome} (${r.reason}) | ${r.tFinal.toPrecision(10)} | ${r.steps} (${r.rejectedSteps}) | ${r.newtonIterations} | ${r.gridPoints} | ${r.regrids} | ${r.cpuSeconds.toFixed(2)} | ${r.maxRssMiB.toFixed(0)} (${r.rssBeforeMiB.toFixed(0)}) | ${details} |`,
    );
  }
}

main();
