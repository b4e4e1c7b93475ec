/**
 * `npm run bench:engine`: per-call time of Γ, ψ, ψ′ at 30, 50 and 100 digits, for the Rungbook
 * engine and for mpmath (Debian python3-mpmath, installed if missing) on the same 1000 points.
 * A script, not a timed test: it prints a table and the memory used by each side.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Decimal from 'decimal.js';
import { special } from '../../shared/engine/index';

const DIGITS = [30, 50, 100] as const;
const POINT_COUNT = 1000;
const TARGET: Record<number, number> = { 30: 1.0, 50: 1.0, 100: 1.5 };
/** Timed passes over the points per case; the median pass is reported (same rule for mpmath). */
const REPEATS = 5;

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)];
}

type FunctionName = 'gamma' | 'psi' | 'psi1';
const FUNCTIONS: FunctionName[] = ['gamma', 'psi', 'psi1'];
const ours: Record<FunctionName, (x: string, digits: number) => Decimal> = {
  gamma: (x, d) => special.gamma(x, d),
  psi: (x, d) => special.digamma(x, d),
  psi1: (x, d) => special.trigamma(x, d),
};

/** Deterministic points in (0.1, 10.1) with 15 significant digits. */
function benchmarkPoints(): string[] {
  let seed = 20240611;
  const next = () => {
    seed = (seed * 48271) % 2147483647;
    return seed / 2147483647;
  };
  return Array.from({ length: POINT_COUNT }, () => (0.1 + 10 * next()).toPrecision(15));
}

function ensureMpmath(): void {
  const probe = spawnSync('python3', ['-c', 'import mpmath'], { encoding: 'utf8' });
  if (probe.status === 0) return;
  // Benchmarks, like tests, never install system packages themselves.
  throw new Error('The reference run needs mpmath: install Debian\'s python3-mpmath.');
}

const MPMATH_SCRIPT = `
import json, sys, time, resource
import mpmath
points = json.load(sys.stdin)
fns = {'gamma': mpmath.gamma, 'psi': lambda x: mpmath.psi(0, x), 'psi1': lambda x: mpmath.psi(1, x)}
out = {'version': mpmath.__version__, 'backend': mpmath.libmp.BACKEND, 'times': {}, 'values': {}}
for dps in ${JSON.stringify(DIGITS)}:
    mpmath.mp.dps = dps
    xs = [mpmath.mpf(p) for p in points]
    for name, f in fns.items():
        for x in xs: f(x)  # warm-up pass, as for the engine
        passes = []
        for _ in range(${REPEATS}):
            t = time.perf_counter()
            for x in xs: f(x)
            passes.append((time.perf_counter() - t) / len(xs) * 1e6)
        out['times'][f'{name}:{dps}'] = sorted(passes)[len(passes) // 2]
    mpmath.mp.dps = dps + 20
    for name, f in fns.items():
        out['values'][f'{name}:{dps}'] = [mpmath.nstr(f(mpmath.mpf(p)), dps + 15) for p in points[:20]]
    mpmath.mp.dps = dps
out['maxrss_kb'] = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss
print(json.dumps(out))
`;

interface MpmathReport {
  version: string;
  backend: string;
  times: Record<string, number>;
  values: Record<string, string[]>;
  maxrss_kb: number;
}

function runMpmath(points: string[]): MpmathReport {
  const dir = mkdtempSync(join(tmpdir(), 'rungbook-bench-'));
  const script = join(dir, 'mpmath_bench.py');
  writeFileSync(script, MPMATH_SCRIPT);
  const out = execFileSync('python3', [script], { input: JSON.stringify(points), encoding: 'utf8', maxBuffer: 64 << 20 });
  return JSON.parse(out) as MpmathReport;
}

function timeOurs(points: string[]): { times: Record<string, number>; values: Record<string, string[]>; heapMB: number; rssMB: number } {
  const times: Record<string, number> = {};
  const values: Record<string, string[]> = {};
  // one untimed round over every case first, so no case is timed before the JIT has settled
  for (const digits of DIGITS) for (const name of FUNCTIONS) for (const x of points) ours[name](x, digits);
  for (const digits of DIGITS) {
    for (const name of FUNCTIONS) {
      const f = ours[name];
      for (const x of points) f(x, digits); // warm-up pass: JIT and per-precision caches
      const passes: number[] = [];
      for (let pass = 0; pass < REPEATS; pass++) {
        const start = process.hrtime.bigint();
        for (const x of points) f(x, digits);
        passes.push(Number(process.hrtime.bigint() - start) / 1e3 / points.length);
      }
      times[`${name}:${digits}`] = median(passes);
      values[`${name}:${digits}`] = points.slice(0, 20).map((x) => f(x, digits).toString());
    }
  }
  const mem = process.memoryUsage();
  return { times, values, heapMB: mem.heapUsed / 2 ** 20, rssMB: mem.rss / 2 ** 20 };
}

/** Points where our value is off by a unit or more in the last digit, against mpmath at digits+20. */
function disagreements(a: string[], b: string[], digits: number): number {
  const W = Decimal.clone({ precision: digits + 20 });
  let bad = 0;
  a.forEach((v, i) => {
    const x = new W(v);
    const y = new W(b[i]);
    const unit = new W(10).pow(y.e - (digits - 1));
    if (x.minus(y).abs().gte(unit)) bad++;
  });
  return bad;
}

function main(): void {
  ensureMpmath();
  const points = benchmarkPoints();
  const engine = timeOurs(points);
  const reference = runMpmath(points);
  console.log(`Points: ${POINT_COUNT} in (0.1, 10.1); Node ${process.version}; mpmath ${reference.version} (backend ${reference.backend})`);
  console.log('');
  console.log(`Median of ${REPEATS} timed passes after warm-up (engine: one untimed round over all cases plus one pass per case; mpmath: one pass per case); value check: first 20 points against mpmath at digits+20.`);
  console.log('');
  console.log('| function | digits | Rungbook µs/call | mpmath µs/call | ratio | target | met | value check |');
  console.log('|---|---|---|---|---|---|---|---|');
  for (const name of FUNCTIONS) {
    for (const digits of DIGITS) {
      const key = `${name}:${digits}`;
      const a = engine.times[key];
      const b = reference.times[key];
      const ratio = a / b;
      const mismatch = disagreements(engine.values[key], reference.values[key], digits);
      const label = name === 'psi1' ? "ψ′" : name === 'psi' ? 'ψ' : 'Γ';
      console.log(`| ${label} | ${digits} | ${a.toFixed(1)} | ${b.toFixed(1)} | ${ratio.toFixed(2)} | ≤ ${TARGET[digits].toFixed(1)} | ${ratio <= TARGET[digits] ? 'yes' : 'no'} | ${mismatch === 0 ? '20/20 correct' : `${mismatch}/20 wrong`} |`);
    }
  }
  console.log('');
  console.log(`Memory: Rungbook heap ${engine.heapMB.toFixed(1)} MB, rss ${engine.rssMB.toFixed(1)} MB; mpmath process max rss ${(reference.maxrss_kb / 1024).toFixed(1)} MB`);
}

main();
