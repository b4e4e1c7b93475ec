import { z } from 'zod';
import {
  CompareResult,
  CouplingTerm,
  ExponentsResult,
  FixedPointCaveat,
  FixedPointsResult,
  FlowResult,
  ScanResult,
  SeriesCoefficients,
  SeriesResult,
} from '../../shared/jobs/contract';
import { isCoefficient, type Coefficient } from './texFormat';

/**
 * A result is read with the job contract's result schema (shared/jobs/contract), never by guessing key
 * names. A result that does not match today's schema (an earlier engine version wrote it) is read with
 * the same schema loosened field by field: a field that does not match today's schema is left out,
 * unknown fields are kept. Such a reading says `earlier: true`, so the view can say that parts may be
 * missing. Each recogniser returns null for a result that lacks what its view needs.
 */

type Json = Record<string, unknown>;
const isObject = (value: unknown): value is Json => typeof value === 'object' && value !== null && !Array.isArray(value);

/** Every field of T optional, down to the leaves; what a loosened schema gives back. */
export type Earlier<T> = T extends readonly (infer E)[] ? Earlier<E>[] : T extends object ? { [K in keyof T]?: Earlier<T[K]> } : T;

/** The contract's schema loosened: object fields optional and dropped when they do not match, unknown fields kept, records keyed by any name. */
function loosen(schema: z.ZodType): z.ZodType {
  if (schema instanceof z.ZodObject) return looseObject([schema]);
  if (schema instanceof z.ZodUnion) {
    const options = schema.options as z.ZodType[];
    return options.every((option) => option instanceof z.ZodObject) ? looseObject(options as z.ZodObject[]) : z.union(options.map(loosen));
  }
  if (schema instanceof z.ZodArray) return z.array(loosen(schema.element as z.ZodType));
  if (schema instanceof z.ZodRecord) return z.record(z.string(), loosen(schema.valueType as z.ZodType));
  if (schema instanceof z.ZodOptional) return loosen(schema.unwrap() as z.ZodType).optional();
  if (schema instanceof z.ZodNullable) return loosen(schema.unwrap() as z.ZodType).nullable();
  return schema;
}

/** One loose object with the fields of all the given objects (the variants of a result, such as mean-field and series exponents). */
function looseObject(variants: z.ZodObject[]): z.ZodType {
  const fields = new Map<string, z.ZodType[]>();
  for (const variant of variants) for (const [key, field] of Object.entries(variant.shape as Record<string, z.ZodType>)) fields.set(key, [...(fields.get(key) ?? []), loosen(field)]);
  const shape = Object.fromEntries([...fields].map(([key, options]) => [key, (options.length === 1 ? options[0] : z.union(options)).optional().catch(undefined)]));
  return z.looseObject(shape);
}

/** A result read with its contract schema, or with the loosened schema (`earlier`); null when neither reads it. */
export type Reading<T> = { earlier: false; result: T } | { earlier: true; result: Earlier<T> };

const loosened = new Map<z.ZodType, z.ZodType>();

export function readResult<S extends z.ZodType>(schema: S, value: unknown): Reading<z.infer<S>> | null {
  const exact = schema.safeParse(value);
  if (exact.success) return { earlier: false, result: exact.data };
  if (!loosened.has(schema)) loosened.set(schema, loosen(schema));
  const loose = loosened.get(schema)!.safeParse(value);
  return loose.success && isObject(loose.data) ? { earlier: true, result: loose.data as Earlier<z.infer<S>> } : null;
}

/** Why a result does not match its contract schema (zod's issues, one per line), or null when it does. */
export function contractProblem(schema: z.ZodType, value: unknown): string | null {
  const parsed = schema.safeParse(value);
  return parsed.success ? null : z.prettifyError(parsed.error);
}

/** Coefficients of a series; in a loosely read result, entries that are not coefficients are left out. */
const coefficients = (list: readonly unknown[] | null | undefined): Coefficient[] => (Array.isArray(list) ? list.filter(isCoefficient) : []);

// ---- series ---------------------------------------------------------------------------------------

export interface SeriesShape {
  lowest: number;
  coeffs: Coefficient[];
  prefactor?: { piExponent: string; twoExponent?: string };
  earlier?: boolean;
}

/** An integral's series (laurent, bubble, fourier, startriangle) or a series inside a flow's trail. */
const AnySeries = z.union([SeriesResult, SeriesCoefficients]);

export function asSeries(result: unknown): SeriesShape | null {
  const reading = readResult(AnySeries, result);
  if (!reading || typeof reading.result.lowest !== 'number' || !Array.isArray(reading.result.coeffs)) return null;
  const { lowest, coeffs } = reading.result;
  const prefactor = 'prefactor' in reading.result && reading.result.prefactor?.piExponent !== undefined ? (reading.result.prefactor as SeriesShape['prefactor']) : undefined;
  return { lowest, coeffs: coefficients(coeffs), prefactor, earlier: reading.earlier };
}

// ---- exponents ------------------------------------------------------------------------------------

export interface ExponentsShape {
  eps: string | null;
  /** Quantity → coefficients of ε^0, ε^1, … */
  series: Record<string, Coefficient[]>;
  values: Record<string, string>;
  /** Every other field of the result (fixed point, relations, Padé values, statement …). */
  extra: Json;
  /** The result as the contract types it (null when read with the loosened schema). */
  contract: ExponentsResult | null;
  earlier: boolean;
}

export function asExponents(result: unknown): ExponentsShape | null {
  const reading = readResult(ExponentsResult, result);
  if (!reading) return null;
  const { series: rawSeries, values: rawValues, eps } = reading.result as Earlier<z.infer<typeof ExponentsResult>> & { series?: Record<string, unknown[]> };
  const { series: _series, values: _values, eps: _eps, ...extra } = result as Json;
  const series: Record<string, Coefficient[]> = {};
  for (const [key, list] of Object.entries(rawSeries ?? {})) if (list) series[key] = coefficients(list);
  const values: Record<string, string> = {};
  for (const [key, value] of Object.entries(rawValues ?? {})) if (typeof value === 'string') values[key] = value;
  if (Object.keys(series).length === 0 && Object.keys(values).length === 0) return null;
  return { eps: eps ?? null, series, values, extra, contract: reading.earlier ? null : reading.result, earlier: reading.earlier };
}

// ---- scans ----------------------------------------------------------------------------------------

/** Scan quantities from Padé approximants carry this prefix: "pade:nuInv". */
export const PADE_PREFIX = 'pade:';

export interface ScanPoint {
  x: number;
  values: Record<string, number>;
  flagged: boolean;
  /** The fixed point followed at this point (the contract's ScanPointResult.fixedPoint, else the scan's); null when none was chosen. */
  fixedPoint: string | null;
}

export interface ScanShape {
  variable: string;
  points: ScanPoint[];
  quantities: string[];
  sStar: number | null;
  meanField: number | null;
  /** The result as the contract types it (null when read with the loosened schema). */
  contract?: ScanResult | null;
  earlier?: boolean;
}

const numberOf = (text: string | null | undefined): number | null => {
  if (typeof text !== 'string' || text.trim() === '') return null;
  const value = Number(text);
  return Number.isFinite(value) ? value : null;
};

/** Points of s with numeric values per quantity (Padé values as "pade:…"); `meanFieldD` gives s = d/2 when the result has no mark. */
export function asScan(result: unknown, meanFieldD?: string): ScanShape | null {
  const reading = readResult(ScanResult, result);
  if (!reading || !Array.isArray(reading.result.points)) return null;
  const scan = reading.result as Earlier<ScanResult>;
  const points: ScanPoint[] = [];
  const quantities = new Set<string>();
  for (const raw of scan.points ?? []) {
    const x = numberOf(raw?.s);
    if (!raw || x === null) continue;
    const values: Record<string, number> = {};
    const take = (entries: Record<string, string | null | undefined> | undefined, prefix: string) => {
      for (const [key, text] of Object.entries(entries ?? {})) {
        const value = numberOf(text);
        if (value === null) continue;
        values[prefix + key] = value;
        quantities.add(prefix + key);
      }
    };
    take(raw.values, '');
    take(raw.pade, PADE_PREFIX);
    points.push({ x, values, flagged: raw.flagged === true, fixedPoint: followedAt(raw, scan) });
  }
  if (points.length === 0) return null;
  const d = numberOf(scan.d) ?? numberOf(meanFieldD);
  const meanField = numberOf(scan.marks?.meanFieldEnd) ?? (d !== null ? d / 2 : null);
  const ordered = [...quantities].sort((a, b) => Number(a.startsWith(PADE_PREFIX)) - Number(b.startsWith(PADE_PREFIX)));
  return { variable: 's', points, quantities: ordered, sStar: numberOf(scan.marks?.sStar), meanField, contract: reading.earlier ? null : reading.result, earlier: reading.earlier };
}

/** A string name or null: earlier results may carry anything (or nothing) here. */
const nameOrNull = (value: unknown): string | null => (typeof value === 'string' && value.trim() !== '' ? value : null);

function followedAt(point: { fixedPoint?: unknown }, scan: Earlier<ScanResult>): string | null {
  return nameOrNull(point.fixedPoint) ?? nameOrNull(scan.fixedPoint);
}

export { isObject };

// ---- flows ----------------------------------------------------------------------------------------

export interface PolynomialTerm {
  monomial: string;
  coeff: Coefficient;
}

const Polynomial = z.array(CouplingTerm);

/** A polynomial in the couplings (and ε) as the flow job writes it: [{monomial: "u^2", coeff: "3"}, …]. */
export function asPolynomial(value: unknown): PolynomialTerm[] | null {
  const parsed = Polynomial.safeParse(value);
  return parsed.success ? parsed.data : null;
}

/** A flow result (β-functions, anomalous dimensions, trail); loosely read results must still have β. */
export function asFlow(result: unknown): { result: Json; earlier: boolean } | null {
  const reading = readResult(FlowResult, result);
  if (!reading || !isObject(reading.result.beta)) return null;
  return { result: reading.result as Json, earlier: reading.earlier };
}

// ---- fixed points ---------------------------------------------------------------------------------

export interface FixedPointShape {
  name: string;
  status: string;
  stable: boolean | null;
  couplings: { name: string; series: Coefficient[]; value: string | null }[];
  stabilityValues: string[] | null;
  /** One entry per stability eigenvalue, in the engine's order; null where that eigenvalue has no ε-series. */
  stabilitySeries: (Coefficient[] | null)[];
  notes: string[];
  /** What must be read before the point's numbers (complex at ε, undecided stability, …). */
  caveats: FixedPointCaveat[];
  /** Eigen-operators of the quadratic-operator matrix at the point, as the engine wrote them (read by QuadraticOperators). */
  quadraticOperators?: unknown;
}

const isCaveat = (value: unknown): value is FixedPointCaveat => isObject(value) && typeof value.kind === 'string' && typeof value.message === 'string';

const coefficientText = (value: Earlier<Coefficient> | null | undefined): string | null =>
  typeof value === 'string' ? value : value && typeof value.expr === 'string' ? value.expr : null;

export function asFixedPoints(result: unknown): { eps: string | null; points: FixedPointShape[]; contract: FixedPointsResult | null; earlier: boolean } | null {
  const reading = readResult(FixedPointsResult, result);
  if (!reading || !Array.isArray(reading.result.fixedPoints)) return null;
  const found = reading.result as Earlier<FixedPointsResult>;
  const points: FixedPointShape[] = [];
  for (const raw of found.fixedPoints ?? []) {
    if (!raw || typeof raw.name !== 'string') return null;
    points.push({
      name: raw.name,
      status: raw.status ?? '',
      stable: typeof raw.stable === 'boolean' ? raw.stable : null,
      couplings: Object.entries(raw.couplings ?? {}).map(([name, entry]) => ({ name, series: coefficients(entry?.series as Coefficient[] | null | undefined), value: coefficientText(entry?.value) })),
      stabilityValues: raw.stability?.values ? raw.stability.values.filter((v): v is string => typeof v === 'string') : null,
      stabilitySeries: (raw.stability?.series ?? []).map((row) => (Array.isArray(row) ? coefficients(row as Coefficient[]) : null)),
      notes: (raw.notes ?? []).filter((note): note is string => typeof note === 'string'),
      caveats: ((raw.caveats ?? []) as unknown[]).filter(isCaveat),
      quadraticOperators: raw.quadraticOperators ?? undefined,
    });
  }
  return { eps: found.eps ?? null, points, contract: reading.earlier ? null : reading.result, earlier: reading.earlier };
}

// ---- comparisons ----------------------------------------------------------------------------------

/** The compare job's result (series variants against a dataset), exactly as the contract has it; null for anything else. */
export function asComparison(result: unknown): CompareResult | null {
  const parsed = CompareResult.safeParse(result);
  return parsed.success ? parsed.data : null;
}
