/**
 * Flow benchmark: `npm run bench:flow`.
 * (a) full two-loop O(N) derivation symbolic in N and s (diagrams → β → fixed point → 1/ν, ω) vs sympy;
 * (b) 1000-point scan of 1/ν and ω at 30 digits vs mpmath evaluating the closed-form series;
 * (c)–(e) three loops: O(N) and cubic derivations symbolic in N at a numeric s (graphs → β → fixed
 * point → exponents), and a 200-point three-loop scan (targets: 10 s, 10 s, 60 s at 30 digits).
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { runJob } from '../../shared/jobs/run';
import { join } from 'node:path';
import { onFamily, onModel } from '../../shared/engine/models/index';
import { flowFor } from '../../shared/engine/flows/index';
import { findFixedPoints } from '../../shared/engine/fixedpoints/index';
import { exponentSeries } from '../../shared/engine/exponents/index';
import { type DerivedFlow } from '../../shared/engine/diagrams/index';
import { type Expression } from '../../shared/engine/symbolic/expression';
import { scanSeries } from '../../shared/engine/scans/index';
import { q, qAdd, qMul } from '../../shared/engine/symbolic/rational';
import { toExactRational } from '../../shared/engine/precision/real';

function ensurePythonPackages(): void {
  const probe = spawnSync('python3', ['-c', 'import sympy, mpmath']);
  if (probe.status === 0) return;
  // Benchmarks, like tests, never install system packages themselves.
  throw new Error('The reference run needs sympy and mpmath: install Debian\'s python3-sympy and python3-mpmath.');
}

function derive() {
  const { flow } = flowFor({ model: onFamily, s: null, loops: 2, digits: 30 });
  const f = flow as DerivedFlow<Expression>;
  const wf = findFixedPoints(onFamily, f, { eps: null }).find((p) => p.name !== 'Gaussian');
  if (!wf) throw new Error('no fixed point');
  return exponentSeries(f, wf);
}

function timeIt<T>(run: () => T, repeats: number): { seconds: number; value: T } {
  let value = run();
  const start = process.hrtime.bigint();
  for (let i = 0; i < repeats; i++) value = run();
  return { seconds: Number(process.hrtime.bigint() - start) / 1e9 / repeats, value };
}

function scanSeriesOnce() {
  const { flow } = flowFor({ model: onModel(1), s: null, loops: 2, digits: 30 });
  const f = flow as DerivedFlow<Expression>;
  const wf = findFixedPoints(onModel(1), f, { eps: null }).find((p) => p.name !== 'Gaussian');
  if (!wf) throw new Error('no fixed point');
  return exponentSeries(f, wf);
}

function ourScan(series: ReturnType<typeof scanSeriesOnce>, points: number) {
  const from = toExactRational('1.55');
  const step = qMul(toExactRational('0.4'), q(1, points - 1));
  const sValues = Array.from({ length: points }, (_, i) => qAdd(from, qMul(step, q(i))));
  return scanSeries({ d: q(3), sValues, series: [{ coefficients: series.nuInv.coefficients() }, { coefficients: series.omega.coefficients() }], digits: 30, shortRangeS: null, withPade: false });
}

ensurePythonPackages();
const points = 1000;
const derivation = timeIt(derive, 3);
const heapBefore = process.memoryUsage().heapUsed;
const once = timeIt(scanSeriesOnce, 1);
const scan = timeIt(() => ourScan(once.value, points), 1);
const heapAfter = process.memoryUsage().heapUsed;
const reference = JSON.parse(execFileSync('python3', [join(__dirname, 'flow_sympy.py'), String(points)], { encoding: 'utf8' }));
const rows = [
  ['(a) two-loop O(N) derivation, symbolic N and s', derivation.seconds, reference.derivation_s, 1 / 20],
  [`(b) ${points}-point scan of 1/ν and ω at 30 digits (evaluation)`, scan.seconds, reference.scan_s, 1.0],
  [`(b') the same including its one-time symbolic derivation in s`, scan.seconds + once.seconds, reference.scan_s, Infinity],
] as const;
console.log('| task | ours (s) | reference (s) | ratio | target |');
console.log('|---|---|---|---|---|');
for (const [task, ours, ref, target] of rows) console.log(`| ${task} | ${ours.toFixed(3)} | ${ref.toFixed(3)} | ${(ours / ref).toFixed(3)} | ${Number.isFinite(target) ? `≤ ${target}` : '—'} |`);
console.log(`memory: rss ${(process.memoryUsage().rss / 2 ** 20).toFixed(0)} MiB, scan heap growth ${((heapAfter - heapBefore) / 2 ** 20).toFixed(1)} MiB`);
console.log(`check: first scan point ours 1/ν = ${scan.value[0].values[0]?.toFixed(25)}, mpmath ${reference.sample[0]}`);

// ---- three loops ------------------------------------------------------------------------------------
const THREE_LOOP_S = process.env.RUNGBOOK_BENCH_S ?? '1.75';
function threeLoopJob(model: Record<string, string>): unknown {
  const result = runJob({ job: 'exponents', model, s: THREE_LOOP_S, d: '3', loops: 3, digits: 30, ...(model.preset === 'cubic' ? { fixedPoint: 'cubic' } : {}) } as never) as { error?: { message: string } };
  if (result.error) throw new Error(result.error.message);
  return result;
}
function timeOnce(run: () => unknown): number {
  const start = process.hrtime.bigint();
  run();
  return Number(process.hrtime.bigint() - start) / 1e9;
}
const threeRows: [string, number, number][] = [
  [`(c) three-loop O(N) derivation symbolic in N at s = ${THREE_LOOP_S}, exponents of O(1) at d = 3`, timeOnce(() => threeLoopJob({ preset: 'on', N: 'N' })) + timeOnce(() => threeLoopJob({ preset: 'on', N: '1' })), 10],
  [`(d) three-loop cubic derivation symbolic in N at s = ${THREE_LOOP_S}, exponents of cubic(3) at d = 3`, timeOnce(() => runJob({ job: 'flow', model: { preset: 'cubic', N: 'N' }, s: THREE_LOOP_S, loops: 3, digits: 30 } as never)) + timeOnce(() => threeLoopJob({ preset: 'cubic', N: '3' })), 10],
  ['(e) 200-point three-loop scan of 1/ν and ω, O(1), d = 3, s from 1.55 to 1.95, 30 digits', timeOnce(() => runJob({ job: 'scan', model: { preset: 'on', N: '1' }, d: '3', loops: 3, s: { from: '1.55', to: '1.95', points: 200 }, quantities: ['nuInv', 'omega'], digits: 30 } as never)), 60],
];
console.log('');
console.log('| three loops | ours (s) | target |');
console.log('|---|---|---|');
for (const [task, seconds, target] of threeRows) console.log(`| ${task} | ${seconds.toFixed(2)} | ≤ ${target} |`);
console.log(`memory after the three-loop rows: rss ${(process.memoryUsage().rss / 2 ** 20).toFixed(0)} MiB, heap ${(process.memoryUsage().heapUsed / 2 ** 20).toFixed(0)} MiB`);
