import type { CellInput, ModelSpec } from './cells';

export type SetupInput = Extract<CellInput, { kind: 'setup' }>;

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
export function jobForCell(input: CellInput, setups: Map<string, SetupInput>): Record<string, unknown> | null {
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
  }
}
