import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { Formula } from '../formula';
import { Card } from '../ui/Card';
import { ScreenBody } from '../ui/ScreenBody';

/** For now the list is always empty: notebooks arrive with the notebook feature. */
export function NotebooksScreen() {
  return (
    <ScreenBody title="Notebooks" subtitle="Your calculations, cell by cell.">
      <Card testID="notebooks-empty">
        <Text style={styles.heading}>No notebooks yet</Text>
        <Text style={styles.body}>
          A notebook holds one calculation as a column of cells: the model and its couplings, the loop
          integrals expanded in ε, the β-functions and anomalous dimensions, the fixed points, and the
          critical exponents with their resummations. Every step is typeset so a colleague can check it.
        </Text>
        <Text style={styles.body}>The expansion parameter measures the distance from the upper critical dimension:</Text>
        <View style={styles.formula}>
          <Formula tex={String.raw`\varepsilon = 2s - d`} display testID="epsilon-definition" label="epsilon equals 2 s minus d" />
        </View>
        <Text style={styles.body}>for the action with a non-local kinetic term,</Text>
        <View style={styles.formula}>
          <Formula tex={String.raw`S = \int d^dx\,\Big[\tfrac12\,\phi\,(-\partial^2)^{s/2}\phi + \tfrac{\lambda}{4!}\,\phi^4\Big]`} display label="long-range phi to the fourth action" />
        </View>
        <Text style={styles.body}>
          A first result a notebook will reproduce, for the one-component model at two loops:
        </Text>
        <View style={styles.formula}>
          <Formula tex={String.raw`\frac{1}{\nu} = s - \frac{\varepsilon}{3} - \frac{\varepsilon^2}{9}\,\big[\psi(1) - 2\psi(\tfrac{s}{2}) + \psi(s)\big] + O(\varepsilon^3)`} display testID="nu-example" label="one over nu, two-loop expansion" />
        </View>
      </Card>
    </ScreenBody>
  );
}

const styles = StyleSheet.create({
  heading: { fontFamily: fonts.semibold, fontSize: 18, color: colors.ink },
  body: { fontFamily: fonts.regular, fontSize: 15, lineHeight: 23, color: colors.inkSoft },
  formula: { paddingVertical: spacing.sm, overflow: 'hidden' },
});
