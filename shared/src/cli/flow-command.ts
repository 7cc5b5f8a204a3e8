// `npm run -s flow -- SPEC.json`: runs one run spec to its outcome (numerics.md §5).
// Progress goes to stderr, exactly one JSON object (the §5 summary) to stdout.
// Exit codes: 0 the run reached an outcome (any outcome), 2 bad usage / unreadable
// file / invalid spec (the field is named on stderr), 1 unexpected engine error.
// This is the only file of the engine that does I/O; keep it thin.
import { readFileSync } from 'node:fs';
import { safeParseRunSpec } from '../spec';
import { advanceFlowRun, createFlowRun, dilationProfileOfRun, runDiagnostics, summarizeFlowRun } from '../flow';

const PROGRESS_EVERY_SECONDS = 1;

function cpuSeconds(start: NodeJS.CpuUsage): number {
  const u = process.cpuUsage(start);
  return (u.user + u.system) / 1e6;
}

function fail(message: string, code = 2): never {
  process.stderr.write(`flow: ${message}\n`);
  process.exit(code);
}

function main(): void {
  const args = process.argv.slice(2).filter((a) => a !== '--');
  const usage = 'usage: npm run -s flow -- SPEC.json [--dilation-profile S1,S2,…]';
  let dilationValues: number[] | null = null;
  const k = args.indexOf('--dilation-profile');
  if (k >= 0) {
    const list = args[k + 1];
    if (list === undefined) fail(`--dilation-profile needs a comma-separated list of s > 0; ${usage}`);
    dilationValues = list.split(',').map((x) => Number(x.trim()));
    if (dilationValues.length === 0 || dilationValues.some((v, i) => !(v > 0 && Number.isFinite(v)) || list.split(',')[i]!.trim() === '')) {
      fail(`--dilation-profile: every s must be a positive finite number (got "${list}")`);
    }
    args.splice(k, 2);
  }
  if (args.length !== 1 || args[0] === '-h' || args[0] === '--help') {
    fail(usage);
  }
  const file = args[0]!;
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (e) {
    fail(`cannot read ${file}: ${(e as Error).message}`);
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    fail(`${file} is not valid JSON: ${(e as Error).message}`);
  }
  const parsed = safeParseRunSpec(json);
  if (!parsed.success) {
    for (const issue of parsed.issues) process.stderr.write(`flow: invalid run spec: ${issue.path}: ${issue.message}\n`);
    process.exit(2);
  }
  if (dilationValues !== null && parsed.spec.domain.kind !== 'sphere') {
    fail('--dilation-profile needs the sphere domain (dilations act on S^m)');
  }
  let run;
  try {
    run = createFlowRun(parsed.spec);
  } catch (e) {
    fail((e as Error).message);
  }
  const initialProfile = dilationValues !== null ? dilationProfileOfRun(run, dilationValues) : null;
  const start = process.cpuUsage();
  let nextReport = PROGRESS_EVERY_SECONDS;
  for (;;) {
    const res = advanceFlowRun(run, {
      shouldStop: () => cpuSeconds(start) >= nextReport,
    });
    const d = runDiagnostics(run);
    process.stderr.write(
      `t=${d.t.toPrecision(10)} step=${d.step} dt=${d.dt.toExponential(2)} N=${d.points} D=${d.energy.toPrecision(8)} ` +
        `|tau|=${d.tension.toExponential(3)} max|grad u|=${d.gradMax.toExponential(3)} at r=${d.gradMaxAt.toExponential(3)}` +
        (d.sigmaDenominator !== null ? ` X=${d.center!.toExponential(2)} sigma=${d.sigma!.toExponential(3)} (denominator ${d.sigmaDenominator.toExponential(3)})` : '') +
        '\n',
    );
    if (res.done) break;
    nextReport = cpuSeconds(start) + PROGRESS_EVERY_SECONDS;
  }
  const summary = summarizeFlowRun(run, cpuSeconds(start));
  process.stderr.write(`outcome: ${summary.outcome} (${summary.reason})\n`);
  const output =
    initialProfile !== null && dilationValues !== null
      ? { ...summary, dilationProfile: { initial: initialProfile, final: dilationProfileOfRun(run, dilationValues) } }
      : summary;
  process.stdout.write(`${JSON.stringify(output)}\n`);
}

try {
  main();
} catch (e) {
  fail(`engine error: ${(e as Error).stack ?? String(e)}`, 1);
}
