import type { CellInput } from '../../shared/notebook/cells';
import { customModel } from '../../shared/engine/models/custom';
import { AppError } from '../http/errors';

/**
 * The checks every cell input passes before it is stored — on save, on import, on restore — so that a
 * cell the editor refuses can never enter a notebook another way. A custom potential is parsed by the
 * engine here, so a bad one never waits for a run.
 */
export function assertCellAccepted(input: CellInput): void {
  if (input.kind !== 'setup' || input.model.preset !== 'custom') return;
  try {
    customModel(input.model.fields, input.model.potential);
  } catch (error) {
    const message = error instanceof Error ? error.message : String(error);
    throw new AppError('validation_failed', `The potential is not a quartic model: ${message}`, { 'input.model.potential': message });
  }
}

