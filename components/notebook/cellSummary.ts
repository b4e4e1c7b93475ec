import type { CellInput, ModelSpec } from '../../shared/notebook';
import { nameOfQuantity } from './texFormat';

export function modelWords(model: ModelSpec): string {
  if (model.preset === 'on') return `O(${model.N}) model`;
  if (model.preset === 'cubic') return `cubic anisotropy, N = ${model.N}`;
  return `own potential in ${model.fields} field${model.fields === 1 ? '' : 's'}`;
}

/** ε = 2s − d when both are numbers. */
export function epsilonOf(input: Extract<CellInput, { kind: 'setup' }>): string | null {
  if (!input.s || !input.d) return null;
  const eps = 2 * Number(input.s) - Number(input.d);
  return Number.isFinite(eps) ? String(Number(eps.toPrecision(12))) : null;
}

/** One line saying what a cell computes, for folded cells, the outline and old versions. */
export function cellSummary(input: CellInput): string {
  switch (input.kind) {
    case 'note':
      return input.text.split('\n').find((line) => line.trim())?.replace(/^#+\s*/, '').slice(0, 80) ?? 'Empty note';
    case 'setup':
      return [modelWords(input.model), `d = ${input.d ?? 'd'}`, `s = ${input.s ?? 's'}`, `${input.loops} loop${input.loops === 1 ? '' : 's'}`, `${input.digits} digits`].join(' · ');
    case 'integral':
      return `${input.form === 'bubble' ? `bubble G(${input.a ?? '?'}, ${input.b ?? '?'})` : input.expr ?? 'Γ-product'} in d = ${input.d}, through ε^${input.order}`;
    case 'flow':
      return `β-functions and anomalous dimensions of ${input.uses}`;
    case 'fixedpoints':
      return `fixed points of ${input.uses} with their stability`;
    case 'exponents':
      return `exponents of ${input.uses}${input.fixedPoint ? ` at ${input.fixedPoint}` : ''}`;
    case 'scan':
      return `${input.quantities.map(nameOfQuantity).join(', ')} for s from ${input.from} to ${input.to} (${input.points} points)`;
    case 'comparison':
      return comparisonSummary(input);
  }
}

function comparisonSummary(input: Extract<CellInput, { kind: 'comparison' }>): string {
  const range = input.xFrom || input.xTo ? `, x from ${input.xFrom ?? 'start'} to ${input.xTo ?? 'end'}` : '';
  const quantity = input.quantity ? `${nameOfQuantity(input.quantity)} of ` : '';
  return `${quantity}${input.uses} against dataset ${input.dataset}${input.show ? ` (as ${input.show === 'boundary' ? 'a boundary' : 'points'})` : ''}${range}${input.kinks ? ', with kinks' : ''}`;
}
