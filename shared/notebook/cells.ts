import { z } from 'zod';
import { COMPARABLE_Y_AXES, DATASET_SHAPES, datasetLabel } from './datasets';
import { JOB_LIMITS, MAX_ABS_N, MAX_FIELDS, MAX_SCAN_POINTS } from '../jobs/contract';

/**
 * Cell kinds of a notebook and their inputs. Inputs are validated here, at the edge, before any job
 * is built; the job itself is validated again by the engine's job schema.
 */
export const cellKinds = ['note', 'setup', 'integral', 'flow', 'fixedpoints', 'exponents', 'scan', 'comparison'] as const;
export type CellKind = (typeof cellKinds)[number];

/** What the UI calls each kind. */
export const cellKindTitles: Record<CellKind, string> = {
  note: 'Note',
  setup: 'Model & parameters',
  integral: 'Loop integral',
  flow: 'RG flow',
  fixedpoints: 'Fixed points',
  exponents: 'Critical exponents',
  scan: 'Scan over s',
  comparison: 'Series against data',
};

const LABEL = /^[a-z][a-z0-9_]{0,31}$/;
const LABEL_RULE = 'A label is a lower-case word (letters, digits, _), at most 32 characters';
export const cellLabel = z.string().regex(LABEL, LABEL_RULE);
/** A reference to another cell by its label; an empty one asks for the choice by name. */
const reference = (missing: string) => z.string().min(1, missing).regex(LABEL, LABEL_RULE);

const DECIMAL_TEXT = /^[+-]?(\d+\.?\d*|\.\d+)$/;
const decimal = z.string().trim().regex(DECIMAL_TEXT, 'Enter a decimal number, e.g. 1.75');
const wholeNumber = z.number({ error: 'Enter a whole number' }).int('Enter a whole number');
const atMostChars = (limit: number) => `At most ${limit.toLocaleString('en')} characters`;
const symbolOrNumber = z.string().trim().regex(/^([A-Za-z]\w*|[+-]?\d+(\.\d+)?)$/, 'Enter a number, or a symbol name such as N');

const fieldCount = wholeNumber.min(1, 'At least one field').max(MAX_FIELDS, `At most ${MAX_FIELDS} field components`);

/**
 * N of a preset: any real number (a decimal is read exactly by the engine) with |N| ≤ MAX_ABS_N; with
 * `symbol`, the letter N keeps O(N) symbolic. One message per problem, in the editor's words.
 */
const presetN = (symbol: boolean) =>
  z.union([z.number(), z.string().trim()]).superRefine((N, context) => {
    if (symbol && N === 'N') return;
    if (typeof N === 'string' && !DECIMAL_TEXT.test(N)) {
      context.addIssue({ code: 'custom', message: symbol ? 'Enter a number (e.g. 3, 0.5, −1) or N' : 'Enter a number, e.g. 3 or 2.5' });
    } else if (!(Math.abs(Number(N)) <= MAX_ABS_N)) {
      context.addIssue({ code: 'custom', message: `N must lie between −${MAX_ABS_N} and ${MAX_ABS_N}` });
    }
  });

export const modelSpec = z.discriminatedUnion('preset', [
  z.strictObject({ preset: z.literal('on'), N: presetN(true) }),
  z.strictObject({ preset: z.literal('cubic'), N: presetN(false) }),
  z.strictObject({
    preset: z.literal('custom'),
    fields: fieldCount,
    potential: z.string().trim().min(1, 'Type the quartic potential').max(JOB_LIMITS.maxExpressionLength, atMostChars(JOB_LIMITS.maxExpressionLength)),
  }),
]);
export type ModelSpec = z.infer<typeof modelSpec>;

export const noteInput = z.strictObject({ kind: z.literal('note'), text: z.string().max(20_000, atMostChars(20_000)) });

const dimension = decimal.refine((v) => Number(v) > 0, 'd must be positive');
const propagatorPower = decimal.refine((v) => Number(v) > 0 && Number(v) <= 2, 's must lie in (0, 2]: s = 2 is the short-range theory');

export const setupInput = z.strictObject({
  kind: z.literal('setup'),
  model: modelSpec,
  d: dimension.optional(),
  s: propagatorPower.optional(),
  loops: z.union([z.literal(1), z.literal(2), z.literal(3)]),
  digits: wholeNumber.min(JOB_LIMITS.minDigits, `At least ${JOB_LIMITS.minDigits} digits`).max(JOB_LIMITS.maxFlowDigits, `At most ${JOB_LIMITS.maxFlowDigits} digits in a notebook`),
});

const uses = reference('Choose the model & parameters cell').describe('label of the setup cell this cell takes its model and parameters from');

export const integralInput = z.strictObject({
  kind: z.literal('integral'),
  uses: uses.optional(),
  form: z.enum(['laurent', 'bubble']),
  expr: z.string().trim().max(JOB_LIMITS.maxExpressionLength, atMostChars(JOB_LIMITS.maxExpressionLength)).optional(),
  a: z.string().trim().max(200, atMostChars(200)).optional(),
  b: z.string().trim().max(200, atMostChars(200)).optional(),
  d: z.string().trim().min(1, 'Give d, e.g. 2*s - eps').max(200, atMostChars(200)),
  order: wholeNumber.min(0, 'The order is a whole number from 0 to 12').max(12, 'The order is a whole number from 0 to 12'),
});

export const flowInput = z.strictObject({ kind: z.literal('flow'), uses });
export const fixedPointsInput = z.strictObject({ kind: z.literal('fixedpoints'), uses });
export const exponentsInput = z.strictObject({
  kind: z.literal('exponents'),
  uses,
  fixedPoint: z.string().trim().max(JOB_LIMITS.maxFixedPointName, atMostChars(JOB_LIMITS.maxFixedPointName)).optional(),
});
/** An end of a scan's range of s: inside (0, 2] whatever d is (the editor also checks s > d/2, §3). */
const scanEnd = decimal.refine((v) => Number(v) > 0 && Number(v) <= 2, 's lies in (0, 2]: s = 2 is the short-range theory');
export const MAX_SCAN_QUANTITIES = 6;

export const scanInput = z
  .strictObject({
    kind: z.literal('scan'),
    uses,
    from: scanEnd,
    to: scanEnd,
    points: wholeNumber.min(2, 'At least 2 points').max(MAX_SCAN_POINTS, `At most ${MAX_SCAN_POINTS} points`),
    quantities: z
      .array(z.enum(['nuInv', 'nu', 'eta', 'gamma', 'omega', 'Delta_phi2', 'Delta_phi4']))
      .min(1, 'Pick at least one quantity')
      .max(MAX_SCAN_QUANTITIES, `Pick at most ${MAX_SCAN_QUANTITIES} quantities`),
    deltaSigmaShortRange: decimal.optional(),
  })
  .refine((input) => Number(input.from) < Number(input.to), {
    message: 'The end of the range must be larger than its start',
    path: ['to'],
    // Checked even while another field is wrong, so a reversed range is named as soon as it is typed.
    when: ({ value }) => isDecimalPair(value),
  });

/**
 * Holds a dataset of the notebook against the series of a scan cell: `uses` names the scan cell (its model,
 * d and range of s), `dataset` the dataset's label. `quantity` defaults to the dataset's y-axis; `xFrom`/`xTo`
 * keep only data inside a range of the data's x (a large dataset must be narrowed to DATASET_LIMITS.maxComparedPoints).
 */
export const comparisonInput = z.strictObject({
  kind: z.literal('comparison'),
  uses: reference('Choose the scan cell').describe('label of the scan cell whose series are compared'),
  dataset: datasetLabel,
  quantity: z.enum(COMPARABLE_Y_AXES).optional(),
  show: z.enum(DATASET_SHAPES).optional(),
  kinks: z.boolean().default(false),
  xFrom: decimal.optional(),
  xTo: decimal.optional(),
}).refine((input) => input.xFrom === undefined || input.xTo === undefined || Number(input.xFrom) < Number(input.xTo), {
  message: 'The end of the range must be larger than its start',
  path: ['xTo'],
});

export const cellInput = z.discriminatedUnion('kind', [noteInput, setupInput, integralInput, flowInput, fixedPointsInput, exponentsInput, scanInput, comparisonInput]);
export type CellInput = z.infer<typeof cellInput>;

function isDecimalPair(value: unknown): boolean {
  const { from, to } = (value ?? {}) as { from?: unknown; to?: unknown };
  return typeof from === 'string' && typeof to === 'string' && DECIMAL_TEXT.test(from.trim()) && DECIMAL_TEXT.test(to.trim());
}

export { symbolOrNumber };
