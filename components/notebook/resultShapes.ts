import type { CompareResult } from '../../shared/jobs/contract';
import { isCoefficient, isDecimal, type Coefficient } from './texFormat';

/** Recognisers for the engine's result shapes. Each returns null for anything it does not know. */

type Json = Record<string, unknown>;
const isObject = (value: unknown): value is Json => typeof value === 'object' && value !== null && !Array.isArray(value);

export interface SeriesShape {
  lowest: number;
  coeffs: Coefficient[];
  prefactor?: { piExponent: string; twoExponent?: string };
}

export function asSeries(result: unknown): SeriesShape | null {
  if (!isObject(result) || typeof result.lowest !== 'number' || !Array.isArray(result.coeffs) || !result.coeffs.every(isCoefficient)) return null;
  const prefactor = isObject(result.prefactor) && typeof result.prefactor.piExponent === 'string' ? (result.prefactor as SeriesShape['prefactor']) : undefined;
  return { lowest: result.lowest, coeffs: result.coeffs as Coefficient[], prefactor };
}

export interface ExponentsShape {
  eps: string | null;
  /** Quantity → coefficients of ε^0, ε^1, … */
  series: Record<string, Coefficient[]>;
  values: Record<string, string>;
  extra: Json;
}

export function asExponents(result: unknown): ExponentsShape | null {
  if (!isObject(result) || !isObject(result.series)) return null;
  const series: Record<string, Coefficient[]> = {};
  for (const [key, coefficients] of Object.entries(result.series)) {
    if (Array.isArray(coefficients) && coefficients.every(isCoefficient)) series[key] = coefficients as Coefficient[];
  }
  const values: Record<string, string> = {};
  if (isObject(result.values)) for (const [key, value] of Object.entries(result.values)) if (typeof value === 'string') values[key] = value;
  if (Object.keys(series).length === 0 && Object.keys(values).length === 0) return null;
  const { series: _series, values: _values, eps, ...extra } = result;
  return { eps: typeof eps === 'string' ? eps : null, series, values, extra };
}

/** Scan quantities from Padé approximants carry this prefix: "pade:nuInv". */
export const PADE_PREFIX = 'pade:';

export interface ScanPoint {
  x: number;
  values: Record<string, number>;
  flagged: boolean;
}

export interface ScanShape {
  variable: string;
  points: ScanPoint[];
  quantities: string[];
  sStar: number | null;
  meanField: number | null;
}

const numberOf = (value: unknown): number | null => {
  if (typeof value === 'number' && Number.isFinite(value)) return value;
  if (isDecimal(value)) return Number(value);
  if (isObject(value) && 'value' in value) return numberOf(value.value);
  return null;
};

function firstNumber(source: Json, keys: string[]): number | null {
  for (const key of keys) {
    const found = numberOf(source[key]);
    if (found !== null) return found;
  }
  return null;
}

/** Points with an abscissa (s or d) and numeric values per quantity; `meanFieldD` fills in s = d/2 when the result omits it. */
export function asScan(result: unknown, meanFieldD?: string): ScanShape | null {
  if (!isObject(result) || !Array.isArray(result.points)) return null;
  const variable = typeof result.variable === 'string' ? result.variable : 's';
  const points: ScanPoint[] = [];
  const quantities = new Set<string>();
  for (const raw of result.points) {
    if (!isObject(raw)) continue;
    const x = firstNumber(raw, [variable, 's', 'd', 'x']);
    if (x === null) continue;
    const source = isObject(raw.values) ? raw.values : raw;
    const values: Record<string, number> = {};
    const take = (entries: Json, prefix: string) => {
      for (const [key, value] of Object.entries(entries)) {
        if (key === variable || key === 's' || key === 'd' || key === 'x' || key === 'eps') continue;
        const number = numberOf(value);
        if (number !== null) {
          values[prefix + key] = number;
          quantities.add(prefix + key);
        }
      }
    };
    take(source, '');
    if (isObject(raw.pade)) take(raw.pade, PADE_PREFIX);
    points.push({ x, values, flagged: raw.flagged === true || raw.outside === true });
  }
  if (points.length === 0) return null;
  const d = numberOf(result.d) ?? numberOf(meanFieldD);
  const marks = isObject(result.marks) ? result.marks : result;
  const meanField = firstNumber(marks, ['meanFieldEnd', 'meanField', 'sMeanField']) ?? (d !== null ? d / 2 : null);
  const sStar = firstNumber(marks, ['sStar', 's_star', 'crossover']);
  const ordered = [...quantities].sort((a, b) => Number(a.startsWith(PADE_PREFIX)) - Number(b.startsWith(PADE_PREFIX)));
  return { variable, points, quantities: ordered, sStar, meanField };
}

export { isObject };

export interface PolynomialTerm {
  monomial: string;
  coeff: Coefficient;
}

/** A polynomial in the couplings (and ε) as the flow job writes it: [{monomial: "u^2", coeff: "3"}, …]. */
export function asPolynomial(value: unknown): PolynomialTerm[] | null {
  if (!Array.isArray(value) || !value.every((term) => isObject(term) && typeof term.monomial === 'string' && isCoefficient(term.coeff))) return null;
  return value as PolynomialTerm[];
}

export interface FixedPointShape {
  name: string;
  status: string;
  stable: boolean | null;
  couplings: { name: string; series: Coefficient[]; value: string | null }[];
  stabilityValues: string[] | null;
  stabilitySeries: Coefficient[][];
  notes: string[];
}

export function asFixedPoints(result: unknown): { eps: string | null; points: FixedPointShape[] } | null {
  if (!isObject(result) || !Array.isArray(result.fixedPoints)) return null;
  const points: FixedPointShape[] = [];
  for (const raw of result.fixedPoints) {
    if (!isObject(raw) || typeof raw.name !== 'string') return null;
    const couplings = isObject(raw.couplings)
      ? Object.entries(raw.couplings).map(([name, entry]) => ({
          name,
          series: isObject(entry) && Array.isArray(entry.series) ? (entry.series.filter(isCoefficient) as Coefficient[]) : [],
          value: isObject(entry) && typeof entry.value === 'string' ? entry.value : null,
        }))
      : [];
    const stability = isObject(raw.stability) ? raw.stability : {};
    points.push({
      name: raw.name,
      status: typeof raw.status === 'string' ? raw.status : '',
      stable: typeof raw.stable === 'boolean' ? raw.stable : null,
      couplings,
      stabilityValues: Array.isArray(stability.values) ? stability.values.map(String) : null,
      stabilitySeries: Array.isArray(stability.series) ? (stability.series.filter(Array.isArray) as Coefficient[][]) : [],
      notes: Array.isArray(raw.notes) ? raw.notes.map(String) : [],
    });
  }
  return { eps: typeof result.eps === 'string' ? result.eps : null, points };
}

const isStringRecord = (value: unknown) => isObject(value) && Object.values(value).every((entry) => entry === null || typeof entry === 'string');

/** The compare job's result (series variants against a dataset); null for anything else. */
export function asComparison(result: unknown): CompareResult | null {
  if (!isObject(result) || typeof result.xAxis !== 'string' || typeof result.quantity !== 'string' || !isObject(result.marks)) return null;
  const { variants, curve, points, summary, notes, marks } = result;
  if (!Array.isArray(variants) || !variants.every((v) => isObject(v) && typeof v.key === 'string' && typeof v.label === 'string')) return null;
  if (!Array.isArray(curve) || !curve.every((row) => isObject(row) && typeof row.x === 'string' && isStringRecord(row.values))) return null;
  if (!Array.isArray(points) || !points.every((row) => isObject(row) && typeof row.x === 'string' && typeof row.y === 'string' && isStringRecord(row.series) && isStringRecord(row.residual))) return null;
  if (!Array.isArray(summary) || !Array.isArray(notes) || !isObject(marks.meanFieldEnd) || !Array.isArray(marks.dataRange)) return null;
  if (result.kinks !== undefined && !(Array.isArray(result.kinks) && result.kinks.every((kink) => isObject(kink) && typeof kink.x === 'string' && isObject(kink.distance)))) return null;
  return result as unknown as CompareResult;
}
