import type { CellInput } from '../../shared/notebook/cells';
import { CellJobError, jobForCell, type SetupInput } from '../../shared/notebook/jobs';
import { customModel } from '../../shared/engine/models/custom';
import { jobCostProblem } from '../../shared/jobs/cost';
import { builtInNameIn } from '../../shared/jobs/contract';
import { AppError } from '../http/errors';

/** The expression fields of a cell input, by the path the editor shows errors at. */
function expressionFields(input: CellInput): [string, string][] {
  if (input.kind === 'integral') return [['input.expr', input.expr], ['input.a', input.a], ['input.b', input.b], ['input.d', input.d]].filter((f): f is [string, string] => typeof f[1] === 'string');
  if (input.kind === 'setup' && input.model.preset === 'custom') return [['input.model.potential', input.model.potential]];
  return [];
}

/**
 * The checks every cell input passes before it is stored — on save, on import, on restore — so that a
 * cell the editor refuses can never enter a notebook another way. A custom potential is parsed by the
 * engine here (its size and degree are bounded before anything is expanded), so a bad one never waits for a run.
 * With the notebook's setups at hand, a cell whose job would be over the engine's work limits is refused too.
 */
export function assertCellAccepted(input: CellInput, setups?: Map<string, SetupInput>): void {
  for (const [field, text] of expressionFields(input)) {
    const name = builtInNameIn(text);
    if (name) {
      const message = `"${name}" cannot be used as a name (it is a built-in property name); choose another name`;
      throw new AppError('validation_failed', message, { [field]: message });
    }
  }
  if (input.kind === 'setup' && input.model.preset === 'custom') {
    try {
      customModel(input.model.fields, input.model.potential);
    } catch (error) {
      const message = error instanceof Error ? error.message : String(error);
      throw new AppError('validation_failed', `The potential is not a quartic model: ${message}`, { 'input.model.potential': message });
    }
  }
  if (setups) assertJobWithinLimits(input, setups);
}

function assertJobWithinLimits(input: CellInput, setups: Map<string, SetupInput>): void {
  let job: Record<string, unknown> | null;
  try {
    job = jobForCell(input, setups);
  } catch (error) {
    // an incomplete cell may be saved; it is refused when it is run
    if (error instanceof CellJobError) return;
    throw error;
  }
  const problem = job ? jobCostProblem(job) : null;
  if (problem) throw new AppError('job_too_large', problem);
}

/**
 * A whole set of cells as one notebook (an import, a restore): labels unique, and every cell passes
 * exactly the checks of saving it, with its job's cost checked against the setups among them.
 */
export function assertCellsAccepted(cells: { label: string; input: CellInput }[]): void {
  const seen = new Set<string>();
  for (const cell of cells) {
    if (seen.has(cell.label)) throw new AppError('conflict', `A cell labelled "${cell.label}" already exists in this notebook.`, { label: 'Label already used' });
    seen.add(cell.label);
  }
  const setups = new Map<string, SetupInput>(cells.flatMap((c) => (c.input.kind === 'setup' ? [[c.label, c.input] as const] : [])));
  for (const cell of cells) {
    try {
      assertCellAccepted(cell.input, setups);
    } catch (error) {
      if (error instanceof AppError) throw new AppError(error.code, `Cell "${cell.label}": ${error.message}`, error.fields);
      throw error;
    }
  }
}
