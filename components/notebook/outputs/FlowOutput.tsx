import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../../constants/theme';
import { CopyableFormula } from '../CopyableFormula';
import { asPolynomial, isObject } from '../resultShapes';
import { fieldMatrixTex, quadraticMatrixTex } from '../quadraticMatrix';
import { polynomialTex, polynomialText } from '../texFormat';
import { TrailEntry } from '../../../shared/jobs/contract';
import { z } from 'zod';
import { DerivationTrail } from './DerivationTrail';
import { StructuredResult } from './StructuredResult';

const anomalousNames: Record<string, string> = { gamma_phi: '\\gamma_{\\phi}', gamma_phi2: '\\gamma_{\\phi^2}' };
/** gamma_phi when γ_φ is a matrix: its trace over the number of fields. */
const TRACE_GAMMA_PHI = '\\tfrac{1}{n}\\operatorname{tr}\\gamma_{\\phi}';
const couplingTex = (name: string) => (name.length > 1 ? `${name[0]}_{${name.slice(1)}}` : name);

/** β-functions and anomalous dimensions typeset, the checks the derivation passed, the diagram trail folded. */
export function FlowOutput({ result, fileName, testID }: { result: Record<string, unknown>; fileName: string; testID?: string }) {
  const { beta, gamma_phi, gamma_phi_matrix, gamma_phi2, gamma_quadratic, convention, checks, trail, model, s, couplings, loops, fieldRenormalization, ...rest } = result;
  const facts = [typeof model === 'string' ? model : null, typeof s === 'string' ? `s = ${s}` : null, typeof loops === 'number' ? `${loops} ${loops === 1 ? 'loop' : 'loops'}` : null, Array.isArray(couplings) ? `couplings ${couplings.join(', ')}` : null, fieldRenormalization === true ? 'with field renormalisation' : fieldRenormalization === false ? 'no field renormalisation' : null].filter(Boolean).join(' · ');
  const matrixTex = quadraticMatrixTex(gamma_quadratic, Number.POSITIVE_INFINITY);
  const fieldTex = fieldMatrixTex(gamma_phi_matrix, Number.POSITIVE_INFINITY);
  const trailEntries = z.array(TrailEntry).safeParse(trail);
  const gammaPhi2Terms = asPolynomial(gamma_phi2);
  const betas = isObject(beta) ? Object.entries(beta).flatMap(([name, terms]) => { const p = asPolynomial(terms); return p ? [{ name, p }] : []; }) : [];
  const anomalous = Object.entries({ gamma_phi, gamma_phi2 }).flatMap(([name, terms]) => { const p = asPolynomial(terms); return p ? [{ name, p }] : []; });
  return (
    <View style={styles.wrap} testID={testID}>
      {facts ? <Text style={styles.caption}>{facts}</Text> : null}
      {typeof convention === 'string' ? <Text style={styles.caption}>{convention}</Text> : null}
      {betas.map(({ name, p }) => <CopyableFormula key={name} tex={(n) => `\\beta_{${couplingTex(name)}} = ${polynomialTex(p, n)}`} text={`β_${name} = ${polynomialText(p)}`} testID={`beta-${name}`} />)}
      {anomalous.map(({ name, p }) => <CopyableFormula key={name} tex={(n) => `${fieldTex && name === 'gamma_phi' ? TRACE_GAMMA_PHI : anomalousNames[name]} = ${polynomialTex(p, n)}`} text={`${name} = ${polynomialText(p)}`} testID={`anomalous-${name}`} />)}
      {fieldTex ? (
        <View style={styles.checks}>
          <Text style={styles.heading}>Field anomalous dimension: a matrix (not ∝ δ_ab); η follows per eigen-direction at a fixed point</Text>
          <CopyableFormula tex={(n) => fieldMatrixTex(gamma_phi_matrix, n) ?? fieldTex} testID="anomalous-field-matrix" />
        </View>
      ) : null}
      {matrixTex ? (
        <View style={styles.checks}>
          <Text style={styles.heading}>Quadratic operators: anomalous-dimension matrix (row: counterterm φ_kφ_l, column: insertion φ_iφ_j)</Text>
          <CopyableFormula tex={(n) => quadraticMatrixTex(gamma_quadratic, n) ?? matrixTex} testID="anomalous-quadratic-matrix" />
        </View>
      ) : null}
      {Array.isArray(checks) && checks.length ? (
        <View style={styles.checks}>
          <Text style={styles.heading}>Checks passed</Text>
          {checks.map((check, index) => <Text key={index} style={styles.check}>✓ {String(check)}</Text>)}
        </View>
      ) : null}
      <StructuredResult value={{ ...rest, ...(gamma_phi_matrix !== undefined && !fieldTex ? { gamma_phi_matrix } : {}), ...(gamma_quadratic !== undefined && !matrixTex ? { gamma_quadratic } : {}), ...(trail !== undefined && !trailEntries.success ? { trail } : {}) }} fileName={fileName} />
      {trailEntries.success && trailEntries.data.length ? (
        <DerivationTrail trail={trailEntries.data} beta={Object.fromEntries(betas.map(({ name, p }) => [name, p]))} gammaPhi2={gammaPhi2Terms} fieldRenormalization={fieldRenormalization === true} />
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: spacing.md },
  caption: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkSoft, lineHeight: 19 },
  checks: { gap: 2 },
  heading: { fontFamily: fonts.semibold, fontSize: 13, color: colors.inkSoft },
  check: { fontFamily: fonts.regular, fontSize: 13, color: colors.success },
});
