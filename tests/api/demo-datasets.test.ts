import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import type { CompareResult } from '../../shared/jobs/contract';
import type { CellView, NotebookDetail } from '../../shared/notebook';
import { INVENTED_LATTICE_CSV, PLANTED_KINK } from '../../server/seed/demoDatasets';
import { startHarness, type Harness } from './harness';
import { settleRun } from './people';

/**
 * The demo notebook with its invented datasets, as a fresh local start creates it: both comparison cells run,
 * the kink locator recovers the kink planted in the invented bound, and the lattice residuals follow from the
 * invented table itself.
 */
describe('demo datasets', () => {
  let h: Harness;
  let notebook: NotebookDetail;
  const lead = () => h.browser();
  let client: ReturnType<Harness['browser']>;

  before(async () => {
    h = await startHarness({ SEED_DEMO_DATA: 'true' });
    client = lead();
    await client.post('/api/auth/sign-in').send({ email: 'lead@demo.rungbook.example', password: 'demo-lead-pass' }).expect(200);
    const [summary] = (await client.get('/api/notebooks').expect(200)).body.notebooks;
    notebook = (await client.get(`/api/notebooks/${summary.id}`).expect(200)).body.notebook;
  });
  after(() => h.close());

  async function resultOf(label: string): Promise<CompareResult> {
    const cell = notebook.cells.find((c: CellView) => c.label === label)!;
    const { run } = (await client.post(`/api/notebooks/${notebook.id}/cells/${cell.id}/run`).expect(202)).body;
    const done = await settleRun(client, run);
    assert.equal(done.status, 'done', JSON.stringify(done.error));
    return done.result as CompareResult;
  }

  test('the demo notebook carries both invented datasets, labelled as invented', () => {
    assert.deepEqual(notebook.datasets.map((d) => d.label).sort(), ['bound', 'lattice']);
    for (const dataset of notebook.datasets) assert.match(`${dataset.name} ${dataset.source}`, /invented/i);
    assert.equal(notebook.cells.find((c) => c.label === 'vsbound')?.state, 'never-run');
  });

  test('the kink locator recovers the planted kink of the invented bound within its stated uncertainty', async () => {
    const result = await resultOf('vsbound');
    assert.equal(result.xAxis, 'Delta_phi');
    assert.ok(result.kinks && result.kinks.length >= 1, 'a kink is found');
    const [kink] = result.kinks;
    const found = Number(kink.x);
    const uncertainty = Number(kink.uncertainty);
    report(`demo bound: planted Δφ = ${PLANTED_KINK.x}, found ${kink.x} ± ${kink.uncertainty} (strength ${kink.strength})`);
    assert.ok(Math.abs(found - PLANTED_KINK.x) <= uncertainty, `found ${found} ± ${uncertainty}, planted ${PLANTED_KINK.x}`);
    assert.ok(uncertainty < 0.01, 'the uncertainty is a small share of the range 0.52–0.74');
    // s = d − 2Δφ with d = 3 (the exact long-range relation; the dataset's axis is Δφ)
    assert.ok(Math.abs(Number(kink.s) - (3 - 2 * found)) < 1e-9);
  });

  test('the lattice residuals and pulls follow from the invented table and the series at each s', async () => {
    const result = await resultOf('vslattice');
    const rows = INVENTED_LATTICE_CSV.split('\n').filter((line) => /^\d/.test(line)).map((line) => line.split('\t').map(Number));
    assert.equal(result.points.length, rows.length);
    for (const [i, [s, y, error]] of rows.entries()) {
      const point = result.points[i];
      assert.equal(Number(point.x), s);
      const series = Number(point.series.order2);
      assert.ok(Math.abs(Number(point.residual.order2) - (series - y)) < 1e-12);
      assert.ok(Math.abs(Number(point.pull!.order2) - (series - y) / error) < 1e-9);
    }
    const chi2 = rows.reduce((sum, _row, i) => sum + Number(result.points[i].pull!.order2) ** 2, 0);
    const summary = result.summary.find((row) => row.key === 'order2')!;
    assert.ok(Math.abs(Number(summary.chi2) - chi2) < 1e-6 * Math.max(1, chi2));
  });
});

/** A line in the test output (the figures quoted in release notes). */
function report(line: string) {
  console.log(`# ${line}`);
}
