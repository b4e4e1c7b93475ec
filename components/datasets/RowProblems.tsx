import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import type { RowProblem } from '../../shared/notebook/datasets';

/** Problems beyond this many are counted, not listed. */
export const SHOWN_PROBLEMS = 50;

export function problemText(problem: RowProblem): string {
  return `Line ${problem.line}${problem.column ? `, column ${problem.column}` : ''}: ${problem.reason}`;
}

/** Why a table was refused, row by row with line numbers; nothing of it was stored. */
export function RowProblems({ title, problems, problemCount }: { title: string; problems: RowProblem[]; problemCount: number }) {
  const shown = problems.slice(0, SHOWN_PROBLEMS);
  const more = Math.max(problemCount, problems.length) - shown.length;
  return (
    <View style={styles.box} accessibilityRole="alert" testID="dataset-problems">
      <Text style={styles.title}>{title}</Text>
      {shown.map((problem, index) => (
        <Text key={`${problem.line}-${index}`} style={styles.line} testID={`dataset-problem-${problem.line}`}>
          {problemText(problem)}
        </Text>
      ))}
      {more > 0 ? <Text style={styles.more}>and {more.toLocaleString('en')} more</Text> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  box: { gap: spacing.xs, borderRadius: 6, padding: spacing.md, borderLeftWidth: 4, borderLeftColor: colors.danger, backgroundColor: colors.dangerWash },
  title: { fontFamily: fonts.semibold, fontSize: 14, color: colors.danger },
  line: { fontFamily: fonts.regular, fontSize: 13, color: colors.ink },
  more: { fontFamily: fonts.medium, fontSize: 13, color: colors.inkSoft },
});
