/**
 * `npm run bench:kinks`: time of the kink locator on the largest job a comparison allows
 * (DATASET_LIMITS.maxComparedPoints = 5000 points) with 200 bootstrap resamples, on invented curves
 * (a slope jump, and a smooth parabola) with noise 10⁻³ of the y-range. Target: a few seconds on one
 * core. A script, not a timed test: it prints a table.
 */
import { locateKinks } from '../../shared/engine/data/kinks';
import { mulberry32 } from '../../shared/engine/data/random';
import { DATASET_LIMITS } from '../../shared/notebook/datasets';

const POINTS = DATASET_LIMITS.maxComparedPoints;
const RESAMPLES = 200;
const REPEATS = 3;
const TARGET_SECONDS = 3;

const CURVES: Record<string, (x: number) => number> = {
  'slope jump at 0.55 (invented)': (x) => 0.5 + 0.8 * x + 0.1 * x * x + 1.5 * Math.max(0, x - 0.55),
  'parabola, no kink (invented)': (x) => 1 + 0.5 * x + 0.8 * x * x,
};

function noisy(f: (x: number) => number): { x: number[]; y: number[] } {
  const random = mulberry32(99);
  const gaussian = () => Math.sqrt(-2 * Math.log(1 - random())) * Math.cos(2 * Math.PI * random());
  const x = Array.from({ length: POINTS }, (_, i) => i / (POINTS - 1));
  const exact = x.map(f);
  const range = Math.max(...exact) - Math.min(...exact);
  return { x, y: exact.map((v) => v + 1e-3 * range * gaussian()) };
}

const rows: string[] = [];
let worst = 0;
for (const [name, f] of Object.entries(CURVES)) {
  const { x, y } = noisy(f);
  const times: number[] = [];
  let summary = '';
  for (let r = 0; r < REPEATS; r++) {
    const start = process.hrtime.bigint();
    const search = locateKinks(x, y, { resamples: RESAMPLES });
    times.push(Number(process.hrtime.bigint() - start) / 1e9);
    summary = search.kinks.map((k) => `${k.x.toFixed(4)} ± ${k.uncertainty.toFixed(4)}`).join(', ') || 'none';
  }
  const median = [...times].sort((a, b) => a - b)[Math.floor(REPEATS / 2)];
  worst = Math.max(worst, median);
  rows.push(`| ${name} | ${POINTS} | ${RESAMPLES} | ${median.toFixed(2)} s | ${summary} |`);
}
console.log('| curve | points | resamples | median time | kinks found |');
console.log('| --- | --- | --- | --- | --- |');
for (const row of rows) console.log(row);
console.log(`heap used: ${(process.memoryUsage().heapUsed / 2 ** 20).toFixed(0)} MiB; target ${TARGET_SECONDS} s: ${worst <= TARGET_SECONDS ? 'met' : 'MISSED'}`);
process.exitCode = worst <= TARGET_SECONDS ? 0 : 1;
