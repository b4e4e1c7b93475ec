import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../../constants/theme';
import { FieldAnomalousSpectrum, type PadeCheck } from '../../../shared/jobs/contract';
import { CopyableFormula } from '../CopyableFormula';
import { isObject, type ExponentsShape } from '../resultShapes';
import { coefficientLines, coefficientText, decimalTex, nameOfQuantity, seriesTex, seriesText, texOfQuantity } from '../texFormat';
import { CoefficientTable } from './CoefficientTable';
import { FieldDirections } from './FieldDirections';
import { QuadraticOperators, quadraticOperatorsOf } from './QuadraticOperators';
import { StructuredResult } from './StructuredResult';

export interface ResultNotice {
  kind: string;
  message: string;
}

/** The `notices` list a job result starts with (caveats of the fixed point, the regime); empty when absent. */
export function noticesOf(result: unknown): ResultNotice[] {
  if (!isObject(result) || !Array.isArray(result.notices)) return [];
  return result.notices.filter((n): n is ResultNotice => isObject(n) && typeof n.kind === 'string' && typeof n.message === 'string');
}

/** What a result must be read with, shown before anything else. */
export function Notices({ notices, testID }: { notices: ResultNotice[]; testID?: string }) {
  if (notices.length === 0) return null;
  return (
    <View style={styles.notices} testID={testID} accessibilityRole="alert">
      {notices.map((notice, index) => (
        <Text key={`${notice.kind}-${index}`} style={styles.notice} testID={testID ? `${testID}-${index}` : undefined}>
          {notice.message}
        </Text>
      ))}
    </View>
  );
}

/** A checked Padé approximant as the exponents job lists it; an earlier result may lack poles, signChange or reason. */
type PadeEntry = Pick<PadeCheck, 'L' | 'M' | 'value' | 'flagged'> & Partial<Pick<PadeCheck, 'poles' | 'signChange' | 'reason'>>;

const isPadeEntry = (value: unknown): value is PadeEntry => isObject(value) && typeof value.L === 'number' && typeof value.M === 'number' && typeof value.flagged === 'boolean';

/** Quantity → its checked Padé approximants (the exponents job's table); null for any other shape. */
function padeTableOf(pade: unknown): Record<string, PadeEntry[]> | null {
  if (!isObject(pade)) return null;
  const table: Record<string, PadeEntry[]> = {};
  for (const [key, entries] of Object.entries(pade)) if (Array.isArray(entries) && entries.every(isPadeEntry)) table[key] = entries;
  return Object.keys(table).length ? table : null;
}

/** Why a flagged approximant has no value: the engine's reason, else what its poles and sign check say (docs/physics.md §9). */
function padeDefect(entry: PadeEntry): string {
  if (entry.reason) return entry.reason;
  if (entry.poles?.length) return `${entry.poles.length > 1 ? 'poles' : 'pole'} at ε = ${entry.poles.join(', ')}`;
  return entry.signChange ? 'the denominator changes sign between 0 and ε' : 'no value';
}

/** A flagged approximant (or one without a value) never shows a number. */
const padeCell = (entry: PadeEntry | undefined) => (!entry ? '' : entry.flagged || entry.value === null ? `defective: ${padeDefect(entry)}` : entry.value);

/** A Padé–Borel sum as the exponents job lists it. */
type BorelEntry = { L: number; M: number; value: string | null; error: string | null; flagged: boolean; poles?: string[]; reason?: string | null };

const isBorelEntry = (value: unknown): value is BorelEntry => isObject(value) && typeof value.L === 'number' && typeof value.M === 'number' && typeof value.flagged === 'boolean';

/** Quantity → its Padé–Borel sums; null for any other shape (an earlier result has none). */
function borelTableOf(borel: unknown): Record<string, BorelEntry[]> | null {
  if (!isObject(borel)) return null;
  const table: Record<string, BorelEntry[]> = {};
  for (const [key, entries] of Object.entries(borel)) if (Array.isArray(entries) && entries.every(isBorelEntry)) table[key] = entries;
  return Object.keys(table).length ? table : null;
}

/** A flagged Padé–Borel sum never shows a number; a value carries its error estimate. */
const borelCell = (entry: BorelEntry | undefined) => {
  if (!entry) return '';
  if (entry.flagged || entry.value === null) return `defective: ${entry.reason ?? (entry.poles?.length ? `pole at t = ${entry.poles.join(', ')}` : 'no value')}`;
  return entry.error && entry.error !== '0' ? `${entry.value} (± ${entry.error})` : entry.value;
};

/** The text-valued entries of an object (a loosely read result may hold anything). */
export const stringRecord = (value: unknown): Record<string, string> => (isObject(value) ? Object.fromEntries(Object.entries(value).filter((e): e is [string, string] => typeof e[1] === 'string')) : {});

/**
 * Critical exponents: notices first, each ε-series typeset, one table of coefficients and values at
 * the physical ε with what each value is computed from, the checked Padé table, and the relations.
 */
export function ExponentsOutput({ result, fileName, testID }: { result: ExponentsShape; fileName: string; testID?: string }) {
  const seriesKeys = Object.keys(result.series);
  const order = Math.max(0, ...seriesKeys.map((key) => result.series[key].length));
  const { pade, borel, borelMethod, relations, fixedPoint, meanField, notices, sources, unavailable, shortRange, fieldAnomalous, statement, quadraticOperators, ...known } = result.extra;
  const operators = quadraticOperatorsOf(quadraticOperators);
  const rest = operators || quadraticOperators === undefined ? known : { ...known, quadraticOperators };
  const spectrum = FieldAnomalousSpectrum.safeParse(fieldAnomalous);
  const extra = spectrum.success || fieldAnomalous === undefined ? rest : { ...rest, fieldAnomalous };
  const sourceOf = stringRecord(sources);
  const missing = stringRecord(unavailable);
  const keys = [...seriesKeys, ...Object.keys(result.values).filter((key) => !seriesKeys.includes(key)), ...Object.keys(missing).filter((key) => !seriesKeys.includes(key) && !(key in result.values))];
  const hasSources = Object.keys(sourceOf).length > 0;
  const header = ['quantity', ...Array.from({ length: order }, (_, k) => `ε^${k}`), result.eps ? `value at ε = ${result.eps}` : 'value', ...(hasSources ? ['computed from'] : [])];
  const rows = keys.map((key) => [
    nameOfQuantity(key),
    ...Array.from({ length: order }, (_, k) => (result.series[key]?.[k] !== undefined ? coefficientText(result.series[key][k]) : '')),
    result.values[key] ?? (missing[key] ? 'not available' : ''),
    ...(hasSources ? [sourceOf[key] ?? ''] : []),
  ]);
  const padeTable = padeTableOf(pade);
  const padeColumns = padeTable ? [...new Map(Object.values(padeTable).flat().map((e) => [`[${e.L}/${e.M}]`, e])).keys()] : [];
  const borelTable = borelTableOf(borel);
  const borelColumns = borelTable ? [...new Map(Object.values(borelTable).flat().map((e) => [`[${e.L}/${e.M}]`, e])).keys()] : [];
  const crossover = isObject(shortRange) && typeof shortRange.sStar === 'string' ? `s* = ${shortRange.sStar} (${String(shortRange.source ?? '')}).` : null;
  const hasExtra = Object.keys(extra).length > 0;
  return (
    <View style={styles.wrap} testID={testID}>
      <Notices notices={noticesOf({ notices })} testID={testID ? `${testID}-notices` : undefined} />
      <Text style={styles.caption}>
        {[typeof fixedPoint === 'string' ? `At the ${fixedPoint} fixed point.` : null, meanField === true ? 'Mean-field: the Gaussian fixed point is stable and these values are exact.' : null, result.eps && result.eps !== 'eps' ? `Series in ε at fixed s; values at ε = ${result.eps}.` : 'Series in ε at fixed s.', crossover].filter(Boolean).join(' ')}
      </Text>
      {typeof statement === 'string' ? <Text style={styles.caption}>{statement}</Text> : null}
      {seriesKeys.map((key) => (
        <CopyableFormula
          key={key}
          tex={(significant) => `${texOfQuantity(key)} = ${seriesTex(0, result.series[key], true, significant)}`}
          text={`${nameOfQuantity(key)} = ${seriesText(0, result.series[key])}`}
          values={coefficientLines(result.series[key])}
          testID={`exponent-${key}`}
        />
      ))}
      {seriesKeys.length === 0 && Object.keys(result.values).length ? <ValuesFormula values={result.values} eps={result.eps} /> : null}
      <CoefficientTable header={header} rows={rows} fileName={fileName} testID={testID ? `${testID}-table` : undefined} />
      {spectrum.success ? <FieldDirections spectrum={spectrum.data} eps={result.eps} fileName={fileName} testID={testID ? `${testID}-fields` : undefined} /> : null}
      {Object.keys(missing).length ? (
        <View style={styles.relations} testID={testID ? `${testID}-unavailable` : undefined}>
          <Text style={styles.heading}>Not available</Text>
          {Object.entries(missing).map(([key, reason]) => <Text key={key} style={styles.caption}>{`${nameOfQuantity(key)}: ${reason}`}</Text>)}
        </View>
      ) : null}
      {padeTable ? (
        <View style={styles.relations}>
          <Text style={styles.heading}>Padé approximants at ε (each checked for poles between 0 and ε and a sign change of the denominator; a defective one has no value)</Text>
          <CoefficientTable
            header={['quantity', ...padeColumns]}
            rows={Object.entries(padeTable).map(([key, entries]) => [nameOfQuantity(key), ...padeColumns.map((column) => padeCell(entries.find((e) => `[${e.L}/${e.M}]` === column)))])}
            fileName={`${fileName}-pade`}
            testID={testID ? `${testID}-pade` : undefined}
          />
        </View>
      ) : null}
      {borelTable ? (
        <View style={styles.relations} testID={testID ? `${testID}-borel` : undefined}>
          <Text style={styles.heading}>Padé–Borel sums at ε (Borel–Padé [L/M]; a pole on the positive t axis leaves no value)</Text>
          {typeof borelMethod === 'string' ? <Text style={styles.caption} testID={testID ? `${testID}-borel-method` : undefined}>{`Method: ${borelMethod}`}</Text> : null}
          <CoefficientTable
            header={['quantity', ...borelColumns]}
            rows={Object.entries(borelTable).map(([key, entries]) => [nameOfQuantity(key), ...borelColumns.map((column) => borelCell(entries.find((e) => `[${e.L}/${e.M}]` === column)))])}
            fileName={`${fileName}-borel`}
            testID={testID ? `${testID}-borel-table` : undefined}
          />
        </View>
      ) : null}
      {isObject(relations) ? (
        <View style={styles.relations}>
          <Text style={styles.heading}>Relations used</Text>
          {Object.entries(relations).map(([key, text]) => <Text key={key} style={styles.caption}>{String(text)}</Text>)}
        </View>
      ) : null}
      {operators ? <QuadraticOperators operators={operators} eps={result.eps} testID={testID ? `${testID}-operators` : undefined} /> : null}
      {hasExtra ? <StructuredResult value={extra} fileName={fileName} /> : null}
    </View>
  );
}

/** Values without series (the mean-field exponents): one typeset list that breaks between quantities. */
function ValuesFormula({ values, eps }: { values: Record<string, string>; eps: string | null }) {
  const entries = Object.entries(values);
  const tex = (significant: number) => entries.map(([key, value]) => `${texOfQuantity(key)} = ${decimalTex(value, significant)}`).join(',\\quad\\allowbreak ');
  const text = entries.map(([key, value]) => `${nameOfQuantity(key)} = ${value}`).join('\n');
  return <CopyableFormula tex={tex} text={text} label={eps ? `values at ε = ${eps}` : undefined} testID="exponent-values" />;
}

const styles = StyleSheet.create({
  wrap: { gap: spacing.md },
  caption: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint },
  relations: { gap: 2 },
  heading: { fontFamily: fonts.semibold, fontSize: 13, color: colors.inkSoft },
  notices: { gap: spacing.xs, padding: spacing.sm, borderRadius: 6, borderWidth: 1, borderColor: colors.amber, backgroundColor: colors.amberWash },
  notice: { fontFamily: fonts.medium, fontSize: 13, color: colors.amberDeep },
});
