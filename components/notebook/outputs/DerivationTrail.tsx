import { useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../../constants/theme';
import type { CouplingTerm, TrailEntry } from '../../../shared/jobs/contract';
import { Formula } from '../../formula';
import { ChipButton } from '../ChipButton';
import { CopyableFormula } from '../CopyableFormula';
import { useDisplayDigits } from '../displayPrecision';
import { WithResultMenu } from '../ResultMenu';
import { decimalTex, FULL_PRECISION, polynomialTex, seriesTex, type Coefficient } from '../texFormat';
import { assemblePoles, samePolynomial } from './trailAssembly';

const FUNCTION_WORDS: Record<TrailEntry['function'], string> = {
  vertex: 'four-point function',
  selfEnergy: 'self-energy (two-point function)',
  massInsertion: 'φ² insertion',
};

const gcd = (a: number, b: number): number => (b === 0 ? a : gcd(b, a % b));

/** \tfrac{175}{100} → \tfrac{7}{4}: Γ arguments and exponents in lowest terms. */
export function reduceFractions(tex: string): string {
  return tex.replace(/\\tfrac\{(\d+)\}\{(\d+)\}/g, (_, p: string, q: string) => {
    const divisor = gcd(Number(p), Number(q)) || 1;
    const [num, den] = [Number(p) / divisor, Number(q) / divisor];
    return den === 1 ? String(num) : `\\tfrac{${num}}{${den}}`;
  });
}

const monomialTexOf = (monomial: string) => monomial.replace(/([a-z]+)(\d*)\^(\d+)/gi, (_, name: string, index: string, power: string) => `${name}${index ? `_{${index}}` : ''}^{${power}}`).replace(/\*/g, '\\,');

/** The weight W_G as a polynomial per projection: "W = -\tfrac{11}{6}\,u^{2}". */
function weightTex(weight: TrailEntry['weight']): string {
  if (!Array.isArray(weight)) return `W:\\ \\text{${weight.note.replace(/[\\{}$&#^_%~]/g, '')}}`;
  return weight
    .flatMap(({ monomial, projections }) => Object.entries(projections).map(([onto, value]) => `W_{${onto === 'δ_ab' ? '\\delta_{ab}' : onto}} = ${decimalTex(value)}\\,${monomialTexOf(monomial)}`))
    .join(',\\quad\\allowbreak ');
}

/** The lines of one graph: weight, integral, Laurent series, counterterms of its subgraphs, subtracted and pole part. */
function graphLines(entry: TrailEntry, significant: number): string[] {
  const series = (s: { lowest: number; coeffs: Coefficient[] }) => seriesTex(s.lowest, s.coeffs, true, significant);
  const poleOnly = (s: { lowest: number; coeffs: Coefficient[] }) => seriesTex(s.lowest, s.coeffs, false, significant);
  return [
    weightTex(entry.weight),
    `I_{\\text{${entry.graph}}} = ${reduceFractions(entry.integral)}`,
    `I_{\\text{${entry.graph}}} = ${series(entry.laurent)}`,
    ...entry.counterterms.map((counterterm) => `K I_{\\gamma} = ${poleOnly(counterterm.pole)}\\ \\text{(${counterterm.subgraph.replace(/[\\{}$&#^_%~]/g, '')})},\\quad\\allowbreak I_{G/\\gamma} = ${reduceFractions(counterterm.reduced)}`),
    ...(entry.counterterms.length ? [`\\bar R\\, I_{\\text{${entry.graph}}} = ${series(entry.subtracted)}`] : []),
    `K \\bar R\\, I_{\\text{${entry.graph}}} = ${entry.pole.coeffs.length ? poleOnly(entry.pole) : '0'}`,
  ];
}

function GraphCard({ entry, testID }: { entry: TrailEntry; testID?: string }) {
  const digits = useDisplayDigits();
  const lines = graphLines(entry, digits);
  const copy = `\\begin{aligned}\n${graphLines(entry, FULL_PRECISION).map((line) => `&${line}`).join(' \\\\\n')}\n\\end{aligned}`;
  return (
    <View style={styles.graph} testID={testID}>
      <WithResultMenu actions={[{ label: 'Copy LaTeX', text: copy }]} testID={testID}>
        <Text style={styles.graphTitle}>{entry.title}</Text>
        <Text style={styles.caption}>
          {FUNCTION_WORDS[entry.function]}, {entry.loops} {entry.loops === 1 ? 'loop' : 'loops'} · sign {entry.sign < 0 ? '−1' : '+1'} · symmetry factor {entry.symmetryFactor} · {entry.labellings} {entry.labellings === 1 ? 'labelling' : 'labellings'}
        </Text>
      </WithResultMenu>
      {lines.map((line, index) => <Formula key={index} tex={line} display />)}
      <Text style={styles.caption}>{entry.rearrangement}</Text>
      {entry.note ? <Text style={styles.caption}>{entry.note}</Text> : null}
    </View>
  );
}

/** u₀ = u + a₁/ε + a₂/ε² … with each a_k typeset. */
function bareTex(bare: string, poles: Map<number, CouplingTerm[]>, significant: number): string {
  const parts = [...poles].filter(([, terms]) => terms.length).sort(([a], [b]) => a - b).map(([k, terms]) => `\\frac{1}{\\varepsilon${k > 1 ? `^{${k}}` : ''}}\\Big(${polynomialTex(terms, significant)}\\Big)`);
  return `${bare} ${parts.length ? `+ ${parts.join(' + ')}` : ''}`;
}

interface AssemblyProps {
  trail: TrailEntry[];
  beta: Record<string, CouplingTerm[]>;
  gammaPhi2: CouplingTerm[] | null;
  fieldRenormalization: boolean;
}

/** How the pole parts add up: the counterterms (Z-factors), then β and γ_{φ²} from their simple poles, checked against the flow's own. */
function Assembly({ trail, beta, gammaPhi2, fieldRenormalization }: AssemblyProps) {
  const blocks = [
    ...Object.entries(beta).map(([coupling, terms]) => {
      const sum = assemblePoles(trail, 'vertex', coupling, 'loops');
      const reported = terms.filter((term) => term.monomial !== `eps*${coupling}`);
      return sum && { key: coupling, bare: `${coupling}_0 = ${coupling}`, rg: `\\beta_{${coupling}} = -\\varepsilon ${coupling} + \\textstyle\\sum_L L\\, a_1^{(L)}`, sum, agrees: samePolynomial(sum.derived, reported), tail: (n: number) => `-\\varepsilon ${coupling} + ${polynomialTex(sum.derived, n)}` };
    }),
    (() => {
      const sum = gammaPhi2 ? assemblePoles(trail, 'massInsertion', 'δ_ab', 'degree') : null;
      return sum && gammaPhi2 && { key: 'phi2', bare: 'Z_t = 1', rg: `\\gamma_{\\phi^2} = (g\\cdot\\partial)\\, z_1`, sum, agrees: samePolynomial(sum.derived, gammaPhi2), tail: (n: number) => polynomialTex(sum.derived, n) };
    })(),
  ].filter((block): block is NonNullable<typeof block> => !!block && block.sum.poles.size > 0);
  if (!blocks.length) return null;
  return (
    <View style={styles.assembly} testID="trail-assembly">
      <Text style={styles.heading}>From pole parts to Z-factors, β and γ (docs/physics.md §1: a_k = −Σ_G W_G (K R̄ I_G)_k)</Text>
      {blocks.map((block) => (
        <View key={block.key} style={styles.block}>
          <CopyableFormula tex={(n) => bareTex(block.bare, new Map([...block.sum.poles].map(([k, terms]) => [k, terms])), n)} />
          <CopyableFormula tex={(n) => `${block.rg} = ${block.tail(n)}`} testID={`trail-assembly-${block.key}`} />
          <Text style={block.agrees ? styles.agrees : styles.caption}>
            {block.agrees ? '✓ agrees with the flow’s result above' : fieldRenormalization ? 'The flow’s result also takes the field renormalisation Z_φ (docs/physics.md §1).' : 'Differs from the flow’s result above: read the checks.'}
          </Text>
        </View>
      ))}
    </View>
  );
}

/** The derivation trail, folded until asked for: each graph typeset with one copy action, then how the poles assemble. */
export function DerivationTrail({ trail, ...assembly }: Omit<AssemblyProps, 'trail'> & { trail: TrailEntry[] }) {
  const [open, setOpen] = useState(false);
  return (
    <View style={styles.wrap} testID="trail">
      <View style={styles.head}>
        <Text style={styles.heading}>Derivation trail ({trail.length} graphs)</Text>
        <ChipButton label={open ? 'Fold' : 'Unfold'} onPress={() => setOpen(!open)} testID="fold-trail" />
      </View>
      {open ? trail.map((entry, index) => <GraphCard key={`${entry.graph}-${entry.function}-${index}`} entry={entry} testID={`trail-${index}`} />) : null}
      {open ? <Assembly trail={trail} {...assembly} /> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: spacing.sm },
  head: { flexDirection: 'row', alignItems: 'center', gap: spacing.sm, flexWrap: 'wrap' },
  heading: { fontFamily: fonts.semibold, fontSize: 13, color: colors.inkSoft, flexShrink: 1 },
  graph: { gap: 2, borderLeftWidth: 2, borderLeftColor: colors.rule, paddingLeft: spacing.md },
  graphTitle: { fontFamily: fonts.semibold, fontSize: 14, color: colors.ink },
  caption: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkSoft },
  assembly: { gap: spacing.sm, paddingTop: spacing.sm },
  block: { gap: 2 },
  agrees: { fontFamily: fonts.medium, fontSize: 13, color: colors.success },
});
