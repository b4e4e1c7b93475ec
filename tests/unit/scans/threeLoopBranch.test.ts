import { test } from 'node:test';
import assert from 'node:assert/strict';
import Decimal from 'decimal.js';
import { branchIsComplexAt } from '../../../shared/engine/scans/scan';
import { type Real } from '../../../shared/engine/precision/real';

const D = Decimal.clone({ precision: 40 });
const r = (x: number) => new D(x) as unknown as Real;

/** Independent check: walk u from 0 in small steps along ε = E(u); the branch reaches ε unless |E| turns back first. */
function walked(b2: number, b3: number, b4: number, eps: number): boolean {
  const E = (u: number) => b2 * u + b3 * u * u + b4 * u * u * u;
  const dir = Math.sign(eps / b2);
  let best = 0;
  for (let i = 1; i <= 2_000_000; i++) {
    const u = (dir * i) / 200_000;
    const e = E(u);
    if (Math.sign(e) === Math.sign(eps) && Math.abs(e) >= Math.abs(eps)) return false;
    if (Math.abs(e) < best || Math.sign(e) !== Math.sign(eps)) return true;
    best = Math.abs(e);
  }
  return true;
}

test('one coupling at three loops: the branch of β/u = −ε + b₂u + b₃u² + b₄u³ is complex at ε exactly where a walk along ε(u) turns back first; b₄ = 0 is b₂² + 4b₃ε < 0', () => {
  let seed = 7;
  const rand = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648) * 2 - 1;
  for (let i = 0; i < 300; i++) {
    const [b2, b3, b4, eps] = [3 * rand(), 6 * rand(), 10 * rand(), Math.abs(rand())];
    if (Math.abs(b2) < 0.1) continue;
    assert.equal(branchIsComplexAt(r(b2), r(b3), r(b4), r(eps)), walked(b2, b3, b4, eps), `b = ${b2}, ${b3}, ${b4}, ε = ${eps}`);
    assert.equal(branchIsComplexAt(r(b2), r(b3), r(0), r(eps)), b2 * b2 + 4 * b3 * eps < 0, `two loops: b = ${b2}, ${b3}, ε = ${eps}`);
  }
});
