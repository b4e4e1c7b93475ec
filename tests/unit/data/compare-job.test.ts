import { test } from 'node:test';
import assert from 'node:assert/strict';
import { runJob } from '../../../shared/jobs';
import { mulberry32 } from '../../../shared/engine/data/random';
import { realContext } from '../../../shared/engine/precision/real';
import { estimatedResultBytes, jobCostProblem } from '../../../shared/jobs/cost';
import type { CompareResult } from '../../../shared/jobs/contract';

type Any = Record<string, any>;
const R = realContext(60);
const ising = { preset: 'on', N: 1 } as const;
const compare = (fields: Any) => runJob({ job: 'compare', model: ising, loops: 2, digits: 20, d: '3', s: { from: '1.55', to: '1.95', points: 5 }, quantity: 'nuInv', ...fields }) as unknown as CompareResult & Any;
const closeTo = (a: string | null | undefined, b: InstanceType<typeof R>, tolerance: string, what: string) => {
  assert.ok(a !== null && a !== undefined, `${what}: no value`);
  assert.ok(new R(a).minus(b).abs().lte(tolerance), `${what}: ${a} vs ${b.toString()}`);
};

test('the two-loop truncation on the curve equals the scan job at loops 2, and the one-loop truncation the scan job at loops 1 (independent runs of the scan)', () => {
  const result = compare({ data: { xAxis: 's', x: ['1.7'], y: ['1.5'] } });
  assert.equal(result.error, undefined, JSON.stringify(result.error));
  const scan = (loops: 1 | 2) => runJob({ job: 'scan', model: ising, loops, digits: 20, d: '3', s: { from: '1.55', to: '1.95', points: 5 }, quantities: ['nuInv'] }) as Any;
  const two = scan(2);
  const one = scan(1);
  result.curve.forEach((point, i) => {
    assert.equal(point.s, two.points[i].s);
    assert.equal(point.values.order2, two.points[i].values.nuInv, `order 2 at s = ${point.s}`);
    assert.equal(point.values.order1, one.points[i].values.nuInv, `order 1 at s = ${point.s}`);
    // the scan's own Padé value is the [1/1] approximant (without pole check) at two loops
    if (!point.defects?.pade_1_1) assert.equal(point.values.pade_1_1, two.points[i].pade.nuInv, `[1/1] at s = ${point.s}`);
  });
});

test('the data point\'s series equals the exponents job at its s, and [1/1] equals c0 + c1ε/(1 − (c2/c1)ε) from that job\'s coefficients (formula written out by hand)', () => {
  const result = compare({ data: { xAxis: 's', x: ['1.8'], y: ['1.5'] } });
  const exps = runJob({ job: 'exponents', model: ising, loops: 2, digits: 30, d: '3', s: '1.8' }) as Any;
  const [c0, c1, c2] = (exps.series.nuInv as string[]).map((c) => new R(c));
  const eps = new R('0.6');
  const pade11 = c0.plus(c1.times(eps).div(new R(1).minus(c2.div(c1).times(eps))));
  closeTo(result.points[0].series.pade_1_1, pade11, '1e-18', '[1/1]');
  closeTo(result.points[0].series.order2, c0.plus(c1.times(eps)).plus(c2.times(eps).times(eps)), '1e-18', 'order 2');
  // [0/1] = c0/(1 − (c1/c0)ε); [0/2] = c0/(1 − (c1/c0)ε + ((c1/c0)² − c2/c0)ε²)  (the reciprocal series truncated at ε²)
  const a = c1.div(c0);
  closeTo(result.points[0].series.pade_0_1, c0.div(new R(1).minus(a.times(eps))), '1e-18', '[0/1]');
  closeTo(result.points[0].series.pade_0_2, c0.div(new R(1).minus(a.times(eps)).plus(a.times(a).minus(c2.div(c0)).times(eps.times(eps)))), '1e-18', '[0/2]');
  // one loop by hand: 1/ν = s − (N+2)/(N+8) ε for the long-range O(N) model (recalled from memory; Fisher, Ma & Nickel 1972): 1.8 − 0.6/3
  closeTo(result.points[0].series.order1, new R('1.6'), '1e-19', 'one loop');
});

test('residuals, pulls and χ² on a tiny invented dataset equal the values computed by hand', () => {
  // Invented data (test only). At s ≤ d/2 = 1.5 every variant is the mean-field 1/ν = s (Landau); at s = 1.8 one loop gives 1.6 (above).
  const result = compare({
    data: { xAxis: 's', x: ['1.2', '1.4', '1.8'], y: ['1.0', '1.5', '1.7'], yErrLow: ['0.1', '0.05', '0.2'], yErrHigh: ['0.4', '0.3', '0.2'] },
  });
  assert.equal(result.error, undefined, JSON.stringify(result.error));
  assert.deepEqual(result.points.map((p) => p.regime), ['mean-field', 'mean-field', 'long-range']);
  const [p1, p2, p3] = result.points;
  assert.equal(p1.series.order2, '1.2');
  assert.equal(p1.residual.order1, '0.2'); // 1.2 − 1.0
  assert.equal(p1.pull?.order1, '0.5'); // series above: 0.2 / 0.4 (upper error)
  assert.equal(p2.residual.order1, '-0.1'); // 1.4 − 1.5
  assert.equal(p2.pull?.order1, '-2'); // series below: −0.1 / 0.05 (lower error)
  assert.equal(p3.residual.order1, '-0.1'); // 1.6 − 1.7
  assert.equal(p3.pull?.order1, '-0.5');
  const one = result.summary.find((s) => s.key === 'order1')!;
  assert.equal(one.points, 3);
  assert.equal(one.chi2, '4.5'); // 0.25 + 4 + 0.25
  assert.equal(one.chi2PerPoint, '1.5');
  closeTo(one.rms, new R('0.06').div(3).sqrt(), '1e-19', 'rms = sqrt((0.04 + 0.01 + 0.01)/3)');
  assert.equal(one.maxAbs, '0.2');
  // without errors: no pulls and no χ²
  const bare = compare({ data: { xAxis: 's', x: ['1.2'], y: ['1.0'] } });
  assert.equal(bare.points[0].pull, undefined);
  assert.equal(bare.summary[0].chi2, null);
  assert.equal(bare.summary[0].rms, '0.2');
});

test('data given as Δφ = (d − s)/2 give the same residuals as the same data given in s, and marks sit on the Δφ axis', () => {
  const s = ['1.2', '1.6', '1.75', '1.9'];
  const y = ['1.1', '1.5', '1.55', '1.6'];
  const inS = compare({ data: { xAxis: 's', x: s, y, yErrLow: ['0.1', '0.1', '0.1', '0.1'] } });
  const deltaPhi = s.map((v) => new R(3).minus(v).div(2).toString()); // (d − s)/2 by hand
  const inDeltaPhi = compare({ data: { xAxis: 'Delta_phi', x: [...deltaPhi].reverse(), y: [...y].reverse(), yErrLow: ['0.1', '0.1', '0.1', '0.1'] } });
  assert.equal(inDeltaPhi.error, undefined, JSON.stringify(inDeltaPhi.error));
  const reversed = [...inDeltaPhi.points].reverse();
  reversed.forEach((p, i) => {
    assert.equal(p.s, s[i]);
    assert.deepEqual(p.residual, inS.points[i].residual, `residuals at s = ${s[i]}`);
    assert.deepEqual(p.pull, inS.points[i].pull, `pulls at s = ${s[i]}`);
  });
  assert.deepEqual(inDeltaPhi.summary, inS.summary);
  assert.deepEqual(inDeltaPhi.marks.meanFieldEnd, { s: '1.5', x: '0.75' }); // s = d/2 ↔ Δφ = d/4
  assert.deepEqual(inDeltaPhi.marks.dataRange, ['0.55', '0.9']);
  assert.equal(inDeltaPhi.curve[0].x, '0.725'); // (3 − 1.55)/2
  assert.ok(inDeltaPhi.notes.some((n) => n.includes('s = d − 2Δφ')));
});

test('mean-field points: every variant is the exact Landau value (1/ν = s, η = 2 − s) and points outside 0 < s ≤ 2 have no series', () => {
  const result = compare({ s: { from: '1.2', to: '1.5', points: 4 }, data: { xAxis: 'Delta_phi', x: ['0.2', '0.8'], y: ['1', '1.3'] } });
  for (const point of result.curve) {
    assert.equal(point.regime, 'mean-field');
    for (const v of result.variants) assert.equal(point.values[v.key], point.s, `${v.key} at s = ${point.s}`);
  }
  const [out, mf] = result.points; // Δφ = 0.2 → s = 2.6; Δφ = 0.8 → s = 1.4
  assert.equal(out.regime, 'outside');
  assert.ok(Object.values(out.series).every((v) => v === null));
  assert.equal(mf.s, '1.4');
  assert.equal(mf.series.pade_0_2, '1.4');
  // O(1) in d = 3 has a built-in Δσ (3D Ising), so the bound is s* rather than 2
  assert.deepEqual(out.defects?.order1, 'Δφ = (d − s)/2 holds only for s < s*; at the short-range point Δφ = (d − 2 + η)/2');
  assert.ok(result.notes.some((n) => n.includes('x = 0.2') && n.includes('s ≥ 1.9637022')), JSON.stringify(result.notes));
  const below = compare({ data: { xAxis: 's', x: ['-0.1'], y: ['1'] } });
  assert.equal(below.points[0].regime, 'outside');
  assert.ok(below.notes.some((n) => n.includes('outside 0 < s ≤ 2') && n.includes('x = -0.1')), JSON.stringify(below.notes));
  const eta = compare({ quantity: 'eta', s: { from: '1.2', to: '1.9', points: 8 }, data: { xAxis: 's', x: ['1.7'], y: ['0.3'] } });
  for (const point of eta.curve) for (const v of eta.variants) assert.equal(point.values[v.key], new R(2).minus(point.s).toString(), `η = 2 − s at s = ${point.s}`);
});

test('no Padé value is written where the approximant is defective, across the whole window', () => {
  const result = compare({ quantity: 'omega', s: { from: '1.52', to: '2', points: 25 }, data: { xAxis: 's', x: ['1.9'], y: ['0.5'] } });
  assert.equal(result.error, undefined, JSON.stringify(result.error));
  for (const point of [...result.curve, ...result.points]) {
    const values = 'values' in point ? point.values : point.series;
    for (const [key, defect] of Object.entries(point.defects ?? {})) {
      assert.equal(values[key], null, `${key} at s = ${point.s}: ${defect}`);
    }
  }
});

test('several couplings (cubic N = 2): each truncation equals the scan job at the same s', () => {
  const cubic = { preset: 'cubic', N: 2 };
  const result = runJob({ job: 'compare', model: cubic, loops: 2, digits: 20, d: '3', s: { from: '1.7', to: '1.9', points: 2 }, quantity: 'nuInv', data: { xAxis: 's', x: ['1.8'], y: ['1.5'] } }) as unknown as CompareResult & Any;
  assert.equal(result.error, undefined, JSON.stringify(result.error));
  const scan = runJob({ job: 'scan', model: cubic, loops: 2, digits: 20, d: '3', s: { from: '1.7', to: '1.9', points: 2 }, quantities: ['nuInv'] }) as Any;
  result.curve.forEach((point, i) => assert.equal(point.values.order2, scan.points[i].values.nuInv, `s = ${point.s}`));
  assert.equal(result.fixedPoint, scan.fixedPoint);
});

test('a boundary: kinks of the invented curve with the series distance at the kink equal to the scan value there minus the kink y', () => {
  // Invented boundary (test only): 1/ν data with a slope change at s = 1.75 and seeded noise of ±0.00025.
  const noise = mulberry32(7);
  const x = Array.from({ length: 121 }, (_, i) => (1.6 + i * 0.0025).toFixed(4));
  const y = x.map((v) => (1.3 + 0.8 * Math.max(0, Number(v) - 1.75) + 0.1 * (Number(v) - 1.6) + 0.0005 * (noise() - 0.5)).toFixed(6));
  const result = compare({ data: { xAxis: 's', x, y, boundary: true } });
  assert.equal(result.error, undefined, JSON.stringify(result.error));
  assert.ok(result.kinks && result.kinks.length >= 1, JSON.stringify(result.notes));
  const kink = result.kinks[0];
  assert.ok(Math.abs(Number(kink.x) - 1.75) <= Number(kink.uncertainty), `planted at 1.75 (within the stated uncertainty), found ${kink.x} ± ${kink.uncertainty}`);
  assert.equal(kink.s, kink.x);
  const scan = runJob({ job: 'scan', model: ising, loops: 2, digits: 20, d: '3', s: { from: kink.s, to: kink.s, points: 2 }, quantities: ['nuInv'] }) as Any;
  // the distance uses the locator's y; the figure shown resolves a millionth of the data's spread (as the kinks job writes it)
  const spread = Math.max(...y.map(Number)) - Math.min(...y.map(Number));
  closeTo(kink.distance.order2, new R(scan.points[0].values.nuInv).minus(kink.y), String(spread * 1e-6), 'distance at two loops');
});

test('bad input is an invalid-job error through the dispatcher: unequal columns, negative errors, a symbolic N', () => {
  const bad = (fields: Any) => (compare(fields) as Any).error;
  assert.equal(bad({ data: { xAxis: 's', x: ['1.7', '1.8'], y: ['1'] } })?.code, 'invalid-job');
  assert.match(bad({ data: { xAxis: 's', x: ['1.7'], y: ['1'], yErrLow: ['-0.1'] } })?.message, /negative error/);
  assert.equal(bad({ data: { xAxis: 'd', x: ['1.7'], y: ['1'] } })?.code, 'invalid-job');
  assert.equal((runJob({ job: 'compare', model: { preset: 'on', N: 'N' }, d: '3', s: { from: '1.6', to: '1.9', points: 2 }, quantity: 'nuInv', data: { xAxis: 's', x: ['1.7'], y: ['1'] } }) as Any).error?.code, 'not-representable');
  // the kinks job is dispatched too: fewer than 8 points are refused
  assert.equal((runJob({ job: 'kinks', points: [['1', '2'], ['2', '3']] }) as Any).error?.code, 'invalid-job');
});

test('cost: a comparison too large to run is refused naming what to reduce; the result-size estimate bounds the real result', () => {
  const many = Array.from({ length: 5000 }, (_, i) => (1.51 + i * 0.00009).toFixed(5));
  const huge = { job: 'compare', model: { preset: 'cubic', N: 6 }, d: '3', s: { from: '1.6', to: '1.9', points: 1000 }, quantity: 'nuInv', data: { xAxis: 's', x: many, y: many } };
  assert.match(jobCostProblem(huge) ?? '', /x-range/);
  const job = { job: 'compare', model: ising, loops: 2, digits: 20, d: '3', s: { from: '1.55', to: '1.95', points: 40 }, quantity: 'nuInv', data: { xAxis: 's', x: many.slice(0, 60), y: many.slice(0, 60), yErrLow: many.slice(0, 60).map(() => '0.01') } };
  assert.equal(jobCostProblem(job), null);
  const actual = JSON.stringify(runJob(job)).length;
  const estimate = estimatedResultBytes(job);
  assert.ok(estimate >= actual && estimate < 1.5 * actual, `estimate ${estimate} for ${actual} characters`);
});

test('progress is reported in order from the start to 1, as scans report it', () => {
  const seen: number[] = [];
  const result = runJob({ job: 'compare', model: ising, d: '3', s: { from: '1.55', to: '1.95', points: 300 }, quantity: 'nuInv', data: { xAxis: 's', x: ['1.7'], y: ['1.5'] } }, { onProgress: (f) => seen.push(f) }) as Any;
  assert.equal(result.error, undefined);
  assert.ok(seen.length > 50, `${seen.length} reports`);
  assert.deepEqual([...seen].sort((a, b) => a - b), seen, 'never backwards');
  assert.equal(seen.at(-1), 1);
});

// ---- the short-range region, Δφ placement, χ² counts and kink figures --------------------------

const deltaSigma = '0.5181489'; // invented for the test (close to the 3d Ising value recalled from memory)
const sStar = new R(3).minus(new R(deltaSigma).times(2)); // s* = 2 − η_SR = d − 2Δσ (exact relation)
const etaShortRange = new R(deltaSigma).times(2).minus(3).plus(2); // η_SR = 2Δσ − d + 2 = 0.0362978 by hand

test('η above s*: every variant is the short-range η = 2Δσ − d + 2, the point stays out of χ², and the notes agree with each other', () => {
  const result = compare({ quantity: 'eta', digits: 6, s: { from: '1.6', to: '1.98', points: 2 }, shortRange: { Delta_sigma: deltaSigma }, data: { xAxis: 's', x: ['1.7', '1.98'], y: ['0.31', '0.0363'], yErrLow: ['0.01', '0.0005'] } });
  assert.equal(result.error, undefined, JSON.stringify(result.error));
  assert.equal(sStar.toString(), '1.9637022');
  const [inside, beyond] = result.points;
  assert.equal(inside.regime, 'long-range');
  assert.equal(beyond.regime, 'short-range');
  for (const v of result.variants) {
    assert.equal(inside.series[v.key], '0.3', `${v.key}: η = 2 − s at s = 1.7 (long-range, exact)`);
    assert.equal(beyond.series[v.key], etaShortRange.toString(), `${v.key}: η_SR at s = 1.98`);
    assert.equal(result.curve[1].values[v.key], etaShortRange.toString(), `${v.key} on the curve at s = 1.98`);
  }
  assert.equal(result.curve[1].regime, 'short-range');
  // only s = 1.7 counts: residual 0.3 − 0.31 = −0.01, pull −0.01/0.01 = −1 (by hand)
  for (const row of result.summary) assert.deepEqual([row.points, row.chi2Points, row.chi2, row.rms], [1, 1, '1', '0.01'], row.key);
  assert.ok(result.notes.some((n) => n.includes('short-range region') && n.includes('x = 1.98') && n.includes('left out of χ²')), JSON.stringify(result.notes));
  assert.ok(!result.notes.some((n) => n.includes('takes over')), 'no note that the series still applies above s*');
  assert.ok(!result.notes.some((n) => /for s < 2\b/.test(n) && n.includes('every variant')), 'the long-range η note stops at s*');
  assert.ok(result.notes.some((n) => n.includes('η = 2 − s exactly for d/2 < s < s*')));
});

test('other quantities above s*, and η at s = 2 without s*: no value, a defect naming the short-range region, nothing in χ²', () => {
  const nu = compare({ s: { from: '1.6', to: '1.98', points: 2 }, shortRange: { Delta_sigma: deltaSigma }, data: { xAxis: 's', x: ['1.97'], y: ['1.5'], yErrLow: ['0.01'] } });
  assert.equal(nu.points[0].regime, 'short-range');
  for (const v of nu.variants) {
    assert.equal(nu.points[0].series[v.key], null);
    assert.equal(nu.points[0].defects?.[v.key], 'short-range region (s ≥ s*): the long-range series does not apply');
    assert.equal(nu.curve[1].values[v.key], null);
  }
  assert.deepEqual([nu.summary[0].points, nu.summary[0].chi2Points, nu.summary[0].chi2], [0, 0, null]);
  // s = 2 is the short-range theory even when s* is unknown (O(4) in d = 3 has no built-in Δσ)
  const eta = compare({ model: { preset: 'on', N: 4 }, quantity: 'eta', s: { from: '1.6', to: '2', points: 2 }, data: { xAxis: 's', x: ['2'], y: ['0.03'], yErrLow: ['0.01'] } });
  assert.equal(eta.curve[1].regime, 'short-range');
  assert.equal(eta.points[0].regime, 'short-range');
  assert.equal(eta.points[0].series.order2, null);
  assert.equal(eta.points[0].defects?.order2, 'short-range region (s = 2): the long-range series does not apply');
  assert.equal(eta.summary[1].chi2, null);
});

test('Δφ data at s ≥ 2 or s ≥ s*: no series, a defect saying why Δφ = (d − s)/2 fails, out of χ² and listed in a note', () => {
  const data = { xAxis: 'Delta_phi', x: ['0.4', '0.5', deltaSigma, '0.55'], y: ['1.4', '1.41', '1.41', '1.5'], yErrLow: ['0.01', '0.01', '0.01', '0.01'] };
  // O(4) in d = 3: no built-in Δσ, so without one the long-range region ends at s = 2
  const job = { quantity: 'Delta_phi2', s: { from: '1.6', to: '2', points: 2 } };
  const plain = compare({ ...job, model: { preset: 'on', N: 4 }, data });
  assert.equal(plain.error, undefined, JSON.stringify(plain.error));
  // s = 3 − 2Δφ: 2.2, 2, 1.9637022, 1.9 (by hand)
  assert.deepEqual(plain.points.map((p) => p.s), ['2.2', '2', '1.9637022', '1.9']);
  assert.deepEqual(plain.points.map((p) => p.regime), ['outside', 'short-range', 'long-range', 'long-range']);
  assert.equal(plain.curve[1].regime, 'short-range', 's = 2 on the curve');
  for (const p of plain.points.slice(0, 2)) {
    for (const v of plain.variants) {
      assert.equal(p.series[v.key], null);
      assert.equal(p.defects?.[v.key], 'Δφ = (d − s)/2 holds only for s < 2; at the short-range point Δφ = (d − 2 + η)/2', `${v.key} at Δφ = ${p.x}`);
    }
  }
  // χ² equals that of the two long-range points given directly in s
  const inS = compare({ ...job, model: { preset: 'on', N: 4 }, data: { xAxis: 's', x: ['1.9637022', '1.9'], y: ['1.41', '1.5'], yErrLow: ['0.01', '0.01'] } });
  assert.deepEqual(plain.summary, inS.summary);
  assert.equal(plain.summary[0].chi2Points, 2);
  assert.ok(plain.notes.some((n) => n.includes('2 data point(s)') && n.includes('x = 0.4, 0.5') && n.includes('left out of χ²')), JSON.stringify(plain.notes));
  assert.ok(!plain.notes.some((n) => n.includes('outside 0 < s ≤ 2')), 'Δφ = 0.4 is named once, with the Δφ reason');

  const withStar = compare({ ...job, shortRange: { Delta_sigma: deltaSigma }, data });
  assert.deepEqual(withStar.points.map((p) => p.regime), ['outside', 'short-range', 'short-range', 'long-range'], 'Δφ = Δσ sits at s* itself');
  assert.equal(withStar.points[2].defects?.order1, 'Δφ = (d − s)/2 holds only for s < s*; at the short-range point Δφ = (d − 2 + η)/2');
  const onlyLast = compare({ ...job, shortRange: { Delta_sigma: deltaSigma }, data: { xAxis: 's', x: ['1.9'], y: ['1.5'], yErrLow: ['0.01'] } });
  assert.deepEqual(withStar.summary, onlyLast.summary);
  assert.ok(withStar.notes.some((n) => n.includes('3 data point(s)') && n.includes('x = 0.4, 0.5, 0.5181489')), JSON.stringify(withStar.notes));
});

test('χ² counts only points with a usable error: chi2Points, χ²/point = χ²/chi2Points, and a note naming the point without one', () => {
  // Invented data. One loop, 1/ν = s − (N+2)/(N+8) ε with ε = 2s − 3 (recalled from memory, as above):
  // s = 1.6 → 1.5333…, below y = 1.6 where the lower error is 0 (no pull); s = 1.7 → 1.5666…, pull (1.5666… − 1.6)/0.01 = −10/3;
  // s = 1.8 → 1.6, pull (1.6 − 1.5)/0.01 = 10. χ² = 100/9 + 100 = 1000/9, over 2 points.
  const result = compare({ data: { xAxis: 's', x: ['1.6', '1.7', '1.8'], y: ['1.6', '1.6', '1.5'], yErrLow: ['0', '0.01', '0.01'], yErrHigh: ['0.01', '0.01', '0.01'] } });
  const one = result.summary.find((row) => row.key === 'order1')!;
  assert.equal(one.points, 3);
  assert.equal(one.chi2Points, 2);
  closeTo(one.chi2, new R(1000).div(9), '1e-17', 'χ²');
  closeTo(one.chi2PerPoint, new R(500).div(9), '1e-17', 'χ²/point = χ²/2');
  assert.equal(result.points[0].pull?.order1, null);
  assert.ok(result.notes.some((n) => n.includes('1 data point(s) have a zero error on the side of the series (x = 1.6)')), JSON.stringify(result.notes));
});

test('kink figures are written as the kinks job writes them (enough digits for the uncertainty), and the distance uses the unrounded y', () => {
  // Invented boundary (test only) on an offset: x steps of 1e-7 around s = 1.75, y = 1000 + a kinked shape 1e-3 high.
  const x = Array.from({ length: 121 }, (_, i) => (1.75 + i * 1e-7).toFixed(8));
  const y = x.map((v, i) => (1000 + 0.001 * (i / 120) + 0.002 * Math.max(0, i - 60) / 120).toFixed(9));
  const result = compare({ data: { xAxis: 's', x, y, boundary: true } });
  assert.equal(result.error, undefined, JSON.stringify(result.error));
  const kinks = runJob({ job: 'kinks', points: x.map((v, i) => [v, y[i]]) }) as Any;
  assert.ok(kinks.kinks.length >= 1 && result.kinks?.length === kinks.kinks.length, JSON.stringify(result.notes));
  const [kink] = result.kinks!;
  assert.deepEqual({ x: kink.x, y: kink.y, uncertainty: kink.uncertainty, strength: kink.strength }, kinks.kinks[0], 'the kinks job on the same points');
  assert.ok(Math.abs(Number(kink.x) - Number(x[60])) <= 3 * Number(kink.uncertainty), `planted at ${x[60]}, found ${kink.x} ± ${kink.uncertainty}`);
  assert.ok(kink.x.replace(/^\d\.|0+$/g, '').length > 5, `more than six digits to resolve ${kink.uncertainty}: ${kink.x}`);
  // series − y at the kink: the scan value at the kink's s minus y, to the y resolution (spread × 1e-6 = 3e-9)
  const scan = runJob({ job: 'scan', model: ising, loops: 2, digits: 20, d: '3', s: { from: kink.s, to: kink.s, points: 2 }, quantities: ['nuInv'] }) as Any;
  closeTo(kink.distance.order2, new R(scan.points[0].values.nuInv).minus(kink.y), '3e-9', 'distance at two loops');
  assert.ok(Number(kink.y) > 1000 && Number(kink.y) < 1000.003, `y within the data: ${kink.y}`);
});

test('a boundary with a repeated x: the note names the two rows as given (1-based, input order) and no kinks are reported', () => {
  // Invented, unsorted: rows 3 and 8 both have x = 1.7.
  const x = ['1.9', '1.62', '1.7', '1.8', '1.66', '1.74', '1.78', '1.7', '1.86', '1.6'];
  const y = x.map((v) => String(Number(v) / 2));
  const result = compare({ data: { xAxis: 's', x, y, boundary: true } });
  assert.deepEqual(result.kinks, []);
  assert.ok(result.notes.includes('No kinks: points 3 and 8 have the same x (1.7); a curve needs one y per x'), JSON.stringify(result.notes));
});

test('O(1) in d = 3 without a typed Δσ uses the built-in 3D Ising Δσ = 0.5181489 (Kos, Poland, Simmons-Duffin, Vichi 2016): the same regimes, values and χ² as typing it, and a note naming the source', () => {
  const data = { xAxis: 's', x: ['1.7', '1.98'], y: ['0.31', '0.0363'], yErrLow: ['0.01', '0.0005'] };
  const job = { quantity: 'eta', digits: 6, s: { from: '1.6', to: '1.98', points: 2 }, data }; // s* printed to 6 digits
  const typed = compare({ ...job, shortRange: { Delta_sigma: deltaSigma } });
  const builtIn = compare(job);
  assert.equal(builtIn.error, undefined, JSON.stringify(builtIn.error));
  assert.deepEqual(builtIn.marks, typed.marks);
  assert.deepEqual(builtIn.curve, typed.curve);
  assert.deepEqual(builtIn.points, typed.points);
  assert.deepEqual(builtIn.summary, typed.summary);
  assert.ok(builtIn.notes.some((n) => n.startsWith('s* = 1.9637 = d − 2Δσ') && n.includes('3D Ising') && n.includes('JHEP 08 (2016) 036')), JSON.stringify(builtIn.notes));
  assert.ok(!typed.notes.some((n) => n.includes('built in')), 'a typed Δσ is not called built in');
});
