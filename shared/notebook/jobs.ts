import type { CellInput, ModelSpec } from './cells';
import { JOB_LIMITS } from '../jobs/contract';
import { COMPARABLE_X_AXES, COMPARABLE_Y_AXES, DATASET_LIMITS, type AxisSpec, type DatasetPoints } from './datasets';

export type SetupInput = Extract<CellInput, { kind: 'setup' }>;

export type ScanInput = Extract<CellInput, { kind: 'scan' }>;
export type ComparisonInput = Extract<CellInput, { kind: 'comparison' }>;

/** A dataset as a comparison job needs it (loaded only when such a cell runs: points may be megabytes). */
export interface DatasetForJob {
  label: string;
  shape: 'points' | 'boundary';
  xAxis: AxisSpec;
  yAxis: AxisSpec;
  points: DatasetPoints;
  contentHash: string;
}

/** What cells beyond setups a job may need: other cells by label (a comparison's scan) and datasets by label. */
export interface CellJobContext {
  cells?: Map<string, CellInput>;
  datasets?: Map<string, DatasetForJob>;
}

export class CellJobError extends Error {
  constructor(readonly field: string, message: string) {
    super(message);
  }
}

function setupFor(label: string | undefined, setups: Map<string, SetupInput>): SetupInput {
  if (!label) throw new CellJobError('uses', 'Choose the model & parameters cell this cell uses');
  const setup = setups.get(label);
  if (!setup) throw new CellJobError('uses', `There is no model & parameters cell labelled "${label}"`);
  return setup;
}

function modelJob(model: ModelSpec): Record<string, unknown> {
  return { ...model };
}

/**
 * The engine job a cell runs: the same object the calc CLI and POST /api/calc accept.
 * Returns null for cells that run nothing (notes, setups).
 */
export function jobForCell(input: CellInput, setups: Map<string, SetupInput>, context: CellJobContext = {}): Record<string, unknown> | null {
  switch (input.kind) {
    case 'note':
    case 'setup':
      return null;
    case 'integral': {
      const setup = input.uses ? setupFor(input.uses, setups) : undefined;
      const at = setup?.s ? { at: { s: setup.s }, digits: setup.digits } : {};
      if (input.form === 'laurent') {
        if (!input.expr) throw new CellJobError('expr', 'Type a product of gamma(...) factors');
        return { job: 'laurent', expr: input.expr, d: input.d, order: input.order, ...at };
      }
      if (!input.a || !input.b) throw new CellJobError(input.a ? 'b' : 'a', 'Give both propagator powers a and b');
      return { job: 'bubble', a: input.a, b: input.b, d: input.d, order: input.order, ...at };
    }
    case 'flow': {
      const setup = setupFor(input.uses, setups);
      return { job: 'flow', model: modelJob(setup.model), loops: setup.loops, digits: setup.digits, ...(setup.s ? { s: setup.s } : {}) };
    }
    case 'fixedpoints':
    case 'exponents': {
      const setup = setupFor(input.uses, setups);
      return {
        job: input.kind,
        model: modelJob(setup.model),
        loops: setup.loops,
        digits: setup.digits,
        ...(setup.d ? { d: setup.d } : {}),
        ...(setup.s ? { s: setup.s } : {}),
        ...(input.kind === 'exponents' && input.fixedPoint ? { fixedPoint: input.fixedPoint } : {}),
      };
    }
    case 'scan': {
      const setup = setupFor(input.uses, setups);
      if (!setup.d) throw new CellJobError('uses', 'A scan over s needs d in its model & parameters cell');
      return {
        job: 'scan',
        model: modelJob(setup.model),
        loops: setup.loops,
        digits: setup.digits,
        d: setup.d,
        s: { from: input.from, to: input.to, points: input.points },
        quantities: input.quantities,
        ...(input.deltaSigmaShortRange ? { shortRange: { Delta_sigma: input.deltaSigmaShortRange } } : {}),
      };
    }
    case 'comparison':
      return comparisonJob(input, setups, context);
  }
}

/** Decimal text compared as numbers (data values are plain decimals; the engine works exactly). */
const inRange = (value: string, from?: string, to?: string) => (from === undefined || Number(value) >= Number(from)) && (to === undefined || Number(value) <= Number(to));

function comparisonJob(input: ComparisonInput, setups: Map<string, SetupInput>, context: CellJobContext): Record<string, unknown> {
  const scan = context.cells?.get(input.uses);
  if (!scan || scan.kind !== 'scan') throw new CellJobError('uses', `There is no scan cell labelled "${input.uses}"`);
  const scanJob = jobForCell(scan, setups, context) as Record<string, unknown>;
  const dataset = context.datasets?.get(input.dataset);
  if (!dataset) throw new CellJobError('dataset', `This notebook has no dataset labelled "${input.dataset}"`);
  if (!(COMPARABLE_X_AXES as readonly string[]).includes(dataset.xAxis.kind)) {
    throw new CellJobError('dataset', `The series are functions of s at fixed d: the dataset's x-axis must be s or Δφ (it is ${dataset.xAxis.label ?? dataset.xAxis.kind})`);
  }
  const quantity = input.quantity ?? ((COMPARABLE_Y_AXES as readonly string[]).includes(dataset.yAxis.kind) ? dataset.yAxis.kind : null);
  if (!quantity) throw new CellJobError('quantity', 'Choose which series quantity the data measures');
  const { points } = dataset;
  const kept = points.x.flatMap((x, i) => (inRange(x, input.xFrom, input.xTo) ? [i] : []));
  if (kept.length === 0) throw new CellJobError('xFrom', 'No data point lies in this x-range');
  if (kept.length > DATASET_LIMITS.maxComparedPoints) {
    throw new CellJobError('xFrom', `${kept.length.toLocaleString('en')} data points lie in this x-range; a comparison takes at most ${DATASET_LIMITS.maxComparedPoints.toLocaleString('en')}: narrow the range`);
  }
  const pick = (column: string[] | undefined) => (column ? kept.map((i) => column[i]) : undefined);
  const { job: _scan, quantities: _quantities, digits, ...curve } = scanJob;
  return {
    job: 'compare',
    ...curve,
    digits: Math.min(Number(digits), JOB_LIMITS.defaultCompareDigits),
    quantity,
    data: {
      xAxis: dataset.xAxis.kind,
      x: pick(points.x),
      y: pick(points.y),
      ...(points.yErrLow ? { yErrLow: pick(points.yErrLow), yErrHigh: pick(points.yErrHigh ?? points.yErrLow) } : {}),
      boundary: input.kinks && (input.show ?? dataset.shape) === 'boundary',
    },
  };
}
