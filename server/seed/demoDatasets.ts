import { mulberry32 } from '../../shared/engine/data/random';
import type { DatasetDescription } from '../../shared/notebook/datasets';

/**
 * DEMO DATA — two invented datasets for the demo notebook (no real measurement or bound is behind them):
 * a short table of "lattice" values of 1/ν with error bars, and a "bootstrap-like" upper bound on Δ_{φ²} as a
 * function of Δφ made from a smooth function with a deliberate kink plus noise. Both are labelled invented.
 */

/** Where the invented bound's kink is planted: Δφ = 0.625, i.e. s = d − 2Δφ = 1.75 in d = 3. */
export const PLANTED_KINK = { x: 0.625, y: 1.5265 } as const;

/** Slopes of the invented bound left and right of the kink, its curvature term, and the noise's standard deviation. */
const BOUND_SHAPE = { slopeLeft: -0.45, slopeRight: -1.4, curvature: 0.5, noise: 3e-4 } as const;

/** Standard normal deviates by Box–Muller. */
function seededNormal(seed: number): () => number {
  // the engine's seeded generator, so every installation gets the same demo curve
  const uniform = mulberry32(seed);
  return () => Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());
}

/** The invented bound without noise: two parabolas meeting at the planted kink with different slopes. */
export function inventedBound(x: number): number {
  const dx = x - PLANTED_KINK.x;
  const slope = dx < 0 ? BOUND_SHAPE.slopeLeft : BOUND_SHAPE.slopeRight;
  return PLANTED_KINK.y + slope * dx + BOUND_SHAPE.curvature * dx * dx;
}

export function inventedBoundCsv(): string {
  const normal = seededNormal(20261202);
  const lines = ['# DEMO DATA (invented): an upper bound on Delta_phi2 against Delta_phi with a planted kink at Delta_phi = 0.625', 'Delta_phi,Delta_phi2_bound'];
  for (let i = 0; i <= 110; i++) {
    const x = 0.52 + 0.002 * i;
    lines.push(`${x.toFixed(3)},${(inventedBound(x) + BOUND_SHAPE.noise * normal()).toFixed(6)}`);
  }
  return `${lines.join('\n')}\n`;
}

/** Invented "lattice" values of 1/ν for the long-range O(3) model in d = 3, with one-standard-deviation errors. */
export const INVENTED_LATTICE_CSV = [
  '# DEMO DATA (invented): "lattice" estimates of 1/nu for long-range O(3) in d = 3',
  's\tnu_inv\terror',
  '1.60\t1.4982\t0.0040',
  '1.65\t1.4921\t0.0045',
  '1.70\t1.4790\t0.0050',
  '1.75\t1.4612\t0.0060',
  '1.80\t1.4401\t0.0070',
  '1.85\t1.4133\t0.0080',
  '1.90\t1.3790\t0.0100',
  '',
].join('\n');

export const demoDatasets: { description: DatasetDescription; text: string; fileName: string }[] = [
  {
    fileName: 'invented-lattice-nu.tsv',
    text: INVENTED_LATTICE_CSV,
    description: {
      label: 'lattice',
      name: 'Invented lattice 1/ν (demo)',
      source: 'DEMO DATA, invented: no real simulation behind these numbers',
      note: 'Seven invented Monte Carlo-style estimates with one-σ errors, for trying the comparison cell.',
      shape: 'points',
      xAxis: { kind: 's' },
      yAxis: { kind: 'nuInv' },
      mapping: { x: 0, y: 1, yError: { kind: 'symmetric', column: 2 } },
      header: true,
    },
  },
  {
    fileName: 'invented-bound-kink.csv',
    text: inventedBoundCsv(),
    description: {
      label: 'bound',
      name: 'Invented Δφ² bound with a kink (demo)',
      source: 'DEMO DATA, invented: a smooth curve with a kink planted at Δφ = 0.625 plus noise (σ = 3·10⁻⁴)',
      note: 'Made to try the kink locator: it should find the kink near Δφ = 0.625 (s = 1.75).',
      shape: 'boundary',
      xAxis: { kind: 'Delta_phi' },
      yAxis: { kind: 'Delta_phi2' },
      mapping: { x: 0, y: 1, yError: { kind: 'none' } },
      header: true,
    },
  },
];
