import { z } from 'zod';
import { MAX_FIELDS } from './limits';
import { DecimalString, ExpressionText } from './primitives';

/** Largest |N| of the O(N) and cubic presets at a numeric N (large-N checks reach 10⁶). */
export const MAX_ABS_N = 1_000_000;

/** The model of a flow job: a preset with its number of fields, or a custom quartic potential. */
const FieldCount = z.number().int().min(1).max(MAX_FIELDS);
const SymbolicN = z.literal('N');
const withinAbsN = (text: string) => Math.abs(Number(text)) <= MAX_ABS_N;

/**
 * N of a preset: "N" keeps it symbolic; otherwise any real N with |N| ≤ MAX_ABS_N, as a number or a
 * decimal string (read exactly: "0.1" is 1/10). Integers 1…MAX_FIELDS use explicit tensors, every
 * other N the symbolic-N family evaluated at N (N = 0: self-avoiding walks; negative or fractional N:
 * analytic continuation).
 */
export const PresetN = z.union([
  SymbolicN,
  z.number().min(-MAX_ABS_N).max(MAX_ABS_N),
  DecimalString.refine(withinAbsN, `|N| must be at most ${MAX_ABS_N}`),
]);
export type PresetN = z.infer<typeof PresetN>;

export const ModelInput = z.discriminatedUnion('preset', [
  z.strictObject({ preset: z.literal('on'), N: PresetN }),
  z.strictObject({ preset: z.literal('cubic'), N: PresetN }),
  z.strictObject({ preset: z.literal('custom'), fields: FieldCount, potential: ExpressionText }),
]);
export type ModelInput = z.infer<typeof ModelInput>;
