import type { CellInput } from '../cells';
import { numberIn } from './equations';
import type { NumberStyle } from './numbers';

type SetupCell = Extract<CellInput, { kind: 'setup' }>;
type Model = SetupCell['model'];

/** N of a preset as TeX: a number, or N itself when the model keeps it symbolic. */
const countTex = (n: string | number) => String(n);

/** A custom potential as typed ("u*phi1^4/24 + v*phi1^2*phi2^2"), factor by factor: phiK → φ_K, ^k → superscript, * → thin space. */
export function potentialTex(potential: string): string {
  return potential
    .replace(/\s+/g, ' ')
    .replace(/[^A-Za-z0-9 +\-*/^().]/g, '')
    .replace(/\bphi(\d+)\b/g, '\\phi_{$1}')
    .replace(/\^(\d+)/g, '^{$1}')
    .replace(/\*/g, '\\,')
    .trim();
}

/** The action of a setup's model, docs/physics.md §1: O(N), cubic anisotropy, or a custom quartic potential V. */
export function actionTex(model: Model): string {
  const kinetic = '\\tfrac12\\,\\phi_a(-\\partial^2)^{s/2}\\phi_a';
  if (model.preset === 'custom') {
    return `S = \\int d^dx\\,\\Big[${kinetic} + V(\\phi)\\Big], \\qquad V(\\phi) = ${potentialTex(model.potential)}`;
  }
  const quartic = '\\frac{\\lambda}{4!}\\,(\\phi_a\\phi_a)^2';
  const cubic = model.preset === 'cubic' ? ' + \\frac{v}{4!}\\sum_{a}\\phi_a^4' : '';
  return `S = \\int d^dx\\,\\Big[${kinetic} + ${quartic}${cubic}\\Big]`;
}

/** "the O(3) model", "the cubic model with N = 4 fields", "a custom model of 2 fields". */
export function modelName(model: Model): string {
  if (model.preset === 'custom') return `a model of ${model.fields} field${model.fields === 1 ? '' : 's'} with a custom quartic potential`;
  return model.preset === 'on' ? `the $O(${countTex(model.N)})$ model` : `the cubic model with $N = ${countTex(model.N)}$ fields`;
}

/** The parameters of a setup cell as one line of formulas: d, s, ε = 2s − d, loops and working digits. */
export function parametersTex(setup: SetupCell, style: NumberStyle): string {
  const exact = { ...style, exact: true };
  const fields = setup.model.preset === 'custom' ? `a = 1,\\dots,${setup.model.fields}` : `a = 1,\\dots,${countTex(setup.model.N)}`;
  const dimension = setup.d ? `d = ${numberIn(setup.d, exact)}` : null;
  const power = setup.s ? `s = ${numberIn(setup.s, exact)}` : null;
  const epsilon = '\\varepsilon = 2s - d';
  return [fields, dimension, power, epsilon].filter(Boolean).join(',\\quad ');
}
