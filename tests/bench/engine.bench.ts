/**
 * `npm run bench:engine`: per-call time of Γ, ψ, ψ′ at 30, 50 and 100 digits, for the Rungbook
 * engine and for mpmath on the same 1000 points; then Γ, ψ and ζ at 1000 digits, cold (first call in
 * a fresh process) and warm (median of repeated calls). mpmath runs under Debian's /usr/bin/python3
 * when present; as root with apt-get available, python3-gmpy2 (mpmath's GMP backend) is installed
 * first if missing. A script, not a timed test: it prints tables, the memory used by each side and
 * which mpmath backend it measured. `npm run bench:engine -- --1000-only` runs the 1000-digit part alone.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, writeFileSync } from 'node:fs';
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

/** Debian's interpreter (where python3-gmpy2 and python3-mpmath install) when present. */
const PYTHON = existsSync('/usr/bin/python3') ? '/usr/bin/python3' : 'python3';

function pythonCan(statement: string): boolean {
  return spawnSync(PYTHON, ['-c', statement], { encoding: 'utf8' }).status === 0;
}

function aptInstall(packages: string[]): void {
  const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;
  if (!isRoot || spawnSync('sh', ['-c', 'command -v apt-get']).status !== 0) return;
  const install = () => spawnSync('apt-get', ['install', '-y', ...packages], { stdio: 'inherit', env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' } }).status === 0;
  if (install()) return;
  spawnSync('apt-get', ['update'], { stdio: 'inherit' });
  install(); // a failure is tolerated: the run falls back to mpmath's pure-Python backend
}

/** mpmath with its GMP backend where it can be had; returns the backend mpmath reports. */
function ensureMpmath(): string {
  if (PYTHON === '/usr/bin/python3' && !pythonCan('import gmpy2, mpmath')) aptInstall(['python3-gmpy2', 'python3-mpmath']);
  if (!pythonCan('import mpmath')) throw new Error(`The reference run needs mpmath for ${PYTHON}: install Debian's python3-mpmath.`);
  return execFileSync(PYTHON, ['-c', 'import mpmath; print(mpmath.libmp.BACKEND)'], { encoding: 'utf8' }).trim();
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
  const out = execFileSync(PYTHON, [script], { input: JSON.stringify(points), encoding: 'utf8', maxBuffer: 64 << 20 });
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
  if (process.argv[2] === '--single') return runSingle(process.argv.slice(3));
  const backend = ensureMpmath();
  console.log(`mpmath backend: ${backend === 'gmpy' ? 'gmpy' : 'python'} (${PYTHON}, mpmath.libmp.BACKEND = ${backend})`);
  console.log('');
  if (process.argv.includes('--1000-only')) return highPrecisionTable(backend);
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
  console.log('');
  highPrecisionTable(reference.backend);
}

// ---- 1000 digits: cold and warm, each case in fresh processes ------------------------------------

const HIGH_DIGITS = 1000;
type HighFunction = 'gamma' | 'psi' | 'zeta';
/** Per case: untimed calls after the cold one (JIT warm-up; mpmath gets the same), then timed repeats. */
const HIGH_CASES: { fn: HighFunction; points: string[]; warmup: number; repeats: number }[] = [
  { fn: 'gamma', points: ['7.25', '0.3', '123.456', '-2.5', '-3.7'], warmup: 60, repeats: 41 },
  { fn: 'psi', points: ['7.25', '0.3', '123.456', '-3.7'], warmup: 30, repeats: 21 },
  { fn: 'zeta', points: ['2.5', '0.5', '-2.5'], warmup: 3, repeats: 5 },
];
const HIGH_OURS: Record<HighFunction, (x: string, digits: number) => Decimal> = {
  gamma: (x, d) => special.gamma(x, d),
  psi: (x, d) => special.digamma(x, d),
  zeta: (x, d) => special.zeta(x, d),
};

interface SingleTiming {
  coldMs: number;
  warmMs: number;
  value: string;
}

/** Child mode `--single fn x digits warmup repeats`: first call (cold), then the median of the repeats (warm). */
function runSingle([fn, x, digits, warmup, repeats]: string[]): void {
  const f = HIGH_OURS[fn as HighFunction];
  const d = Number(digits);
  let start = performance.now();
  const value = f(x, d).toString();
  const coldMs = performance.now() - start;
  for (let i = 0; i < Number(warmup); i++) f(x, d);
  const times: number[] = [];
  for (let i = 0; i < Number(repeats); i++) {
    start = performance.now();
    f(x, d);
    times.push(performance.now() - start);
  }
  const result: SingleTiming = { coldMs, warmMs: median(times), value };
  process.stdout.write(JSON.stringify(result));
}

const MPMATH_SINGLE = `
import json, sys, time
import mpmath
fn, x, dps, warmup, repeats = sys.argv[1], sys.argv[2], int(sys.argv[3]), int(sys.argv[4]), int(sys.argv[5])
f = {'gamma': mpmath.gamma, 'psi': lambda v: mpmath.psi(0, v), 'zeta': mpmath.zeta}[fn]
mpmath.mp.dps = dps
v = mpmath.mpf(x)
t = time.perf_counter(); f(v); cold = time.perf_counter() - t
for _ in range(warmup): f(v)
times = []
for _ in range(repeats):
    t = time.perf_counter(); f(v); times.append(time.perf_counter() - t)
times.sort()
mpmath.mp.dps = dps + 20
value = mpmath.nstr(f(mpmath.mpf(x)), dps + 15)
print(json.dumps({'coldMs': cold * 1e3, 'warmMs': times[len(times) // 2] * 1e3, 'value': value}))
`;

function oursSingle(fn: HighFunction, x: string, warmup: number, repeats: number): SingleTiming {
  const args = ['--import', 'tsx', __filename, '--single', fn, x, String(HIGH_DIGITS), String(warmup), String(repeats)];
  return JSON.parse(execFileSync(process.execPath, args, { encoding: 'utf8', maxBuffer: 1 << 24 })) as SingleTiming;
}

function mpmathSingle(script: string, fn: HighFunction, x: string, warmup: number, repeats: number): SingleTiming {
  const args = [script, fn, x, String(HIGH_DIGITS), String(warmup), String(repeats)];
  return JSON.parse(execFileSync(PYTHON, args, { encoding: 'utf8', maxBuffer: 1 << 24 })) as SingleTiming;
}

function highPrecisionTable(backend: string): void {
  const dir = mkdtempSync(join(tmpdir(), 'rungbook-bench-'));
  const script = join(dir, 'mpmath_single.py');
  writeFileSync(script, MPMATH_SINGLE);
  console.log(`${HIGH_DIGITS} digits, every case in a fresh process on each side: cold = first call (tables and constants built), warm = median of the timed repeats after untimed warm-up calls (the same counts on both sides); mpmath backend ${backend}; value check against mpmath at ${HIGH_DIGITS}+20 digits.`);
  console.log('');
  console.log('| function | x | digits | Rungbook cold ms | Rungbook warm ms | mpmath cold ms | mpmath warm ms | warm ratio | value check |');
  console.log('|---|---|---|---|---|---|---|---|---|');
  for (const { fn, points, warmup, repeats } of HIGH_CASES) {
    for (const x of points) {
      const ours = oursSingle(fn, x, warmup, repeats);
      const ref = mpmathSingle(script, fn, x, warmup, repeats);
      const wrong = disagreements([ours.value], [ref.value], HIGH_DIGITS);
      const label = fn === 'gamma' ? 'Γ' : fn === 'psi' ? 'ψ' : 'ζ';
      console.log(`| ${label} | ${x} | ${HIGH_DIGITS} | ${ours.coldMs.toFixed(1)} | ${ours.warmMs.toFixed(2)} | ${ref.coldMs.toFixed(1)} | ${ref.warmMs.toFixed(2)} | ${(ours.warmMs / ref.warmMs).toFixed(2)} | ${wrong === 0 ? 'correct' : 'WRONG'} |`);
    }
  }
}

main();
