import { z } from 'zod';
import { MAX_FIELDS } from './limits';
import { ExpressionText } from './primitives';

/** The model of a flow job: a preset with its number of fields, or a custom quartic potential. */
const FieldCount = z.number().int().min(1).max(MAX_FIELDS);
const SymbolicN = z.literal('N');

export const ModelInput = z.discriminatedUnion('preset', [
  z.strictObject({ preset: z.literal('on'), N: z.union([FieldCount, SymbolicN]) }),
  z.strictObject({ preset: z.literal('cubic'), N: z.union([FieldCount, SymbolicN]) }),
  z.strictObject({ preset: z.literal('custom'), fields: FieldCount, potential: ExpressionText }),
]);
export type ModelInput = z.infer<typeof ModelInput>;
