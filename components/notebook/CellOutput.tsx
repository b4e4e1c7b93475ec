import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { isRunActive, useCancelRunMutation, useRunQuery } from '../../hooks/api/notebooks';
import type { CellInput, CellView, NotebookDetail, RunView } from '../../shared/notebook';
import { Notice } from '../ui/Notice';
import { usePresentationMode } from '../ui/presentationMode';
import { ChipButton } from './ChipButton';
import { CopyableFormula } from './CopyableFormula';
import { epsilonOf } from './cellSummary';
import { comparisonDisplay } from './outputs/ComparisonOutput';
import { ResultView } from './outputs/ResultView';
import { ProgressBar } from './ProgressBar';

/** Which reference is missing: the scan cell or dataset of a comparison, else the model & parameters cell. */
function brokenReferenceMessage(notebook: NotebookDetail, cell: CellView): string {
  if (cell.input.kind === 'comparison') {
    const { uses, dataset } = cell.input;
    if (!notebook.cells.some((other) => other.label === uses && other.kind === 'scan')) return `There is no scan cell labelled "${uses}". Edit this cell to choose one.`;
    if (!notebook.datasets.some((other) => other.label === dataset)) return `This notebook has no dataset labelled "${dataset}". Open Data to add one, or edit this cell.`;
  }
  const uses = 'uses' in cell.input ? cell.input.uses : undefined;
  return `There is no model & parameters cell labelled "${uses ?? ''}". Edit this cell to choose one.`;
}

/** What a cell has computed: progress while it runs, the error if it failed, the result when done. */
export function CellOutput({ notebook, cell }: { notebook: NotebookDetail; cell: CellView }) {
  if (cell.input.kind === 'setup') return <SetupOutput input={cell.input} label={cell.label} />;
  if (cell.kind === 'note') return null;
  if (cell.state === 'broken-reference') {
    return <Notice tone="error" message={brokenReferenceMessage(notebook, cell)} testID={`cell-${cell.label}-broken`} />;
  }
  const lastRun = cell.lastRun;
  if (!lastRun) return <Text style={styles.hint}>Not computed yet. Run it to see the result.</Text>;
  if (isRunActive(lastRun)) return <RunningOutput notebookId={notebook.id} cell={cell} run={lastRun} />;
  return <FinishedOutput notebook={notebook} cell={cell} run={lastRun} />;
}

/**
 * A finished run: its error or result, then how it ran (left off a slide). A result of earlier inputs keeps
 * full contrast (fading it would drop text below WCAG AA's 4.5:1) and is marked by an amber rule and a label.
 */
function FinishedOutput({ notebook, cell, run: lastRun }: { notebook: NotebookDetail; cell: CellView; run: RunView }) {
  const presenting = usePresentationMode();
  const stale = cell.state === 'out-of-date';
  return (
    <View style={[styles.output, stale && styles.stale]} testID={`cell-${cell.label}-output`}>
      {stale ? <Text style={styles.staleLabel} testID={`cell-${cell.label}-output-stale`}>Result of earlier inputs</Text> : null}
      {lastRun.status === 'failed' || lastRun.status === 'cancelled' ? (
        <Notice tone="error" message={lastRun.error?.message ?? (lastRun.status === 'cancelled' ? 'The run was cancelled.' : 'The run failed.')} testID={`cell-${cell.label}-error`} />
      ) : (
        <ResultView kind={cell.kind} result={lastRun.result} label={cell.label} setupD={setupDOf(notebook, cell.input)} {...comparisonDisplay(cell.input, notebook.datasets)} />
      )}
      {presenting ? null : <Text style={styles.meta} testID={`cell-${cell.label}-facts`}>{runFacts(lastRun)}</Text>}
    </View>
  );
}

function RunningOutput({ notebookId, cell, run }: { notebookId: string; cell: CellView; run: RunView }) {
  const live = useRunQuery(notebookId, run.id).data ?? run;
  const cancel = useCancelRunMutation(notebookId);
  const presenting = usePresentationMode();
  return (
    <View style={styles.output} testID={`cell-${cell.label}-running`}>
      <Text style={styles.meta}>{live.status === 'queued' ? 'Waiting for a worker…' : `Computing… ${Math.round(live.progress * 100)} %`}</Text>
      <ProgressBar progress={live.progress} testID={`cell-${cell.label}-progress`} />
      {presenting ? null : <ChipButton label="Cancel" tone="danger" onPress={() => cancel.mutate(run.id)} testID={`cell-${cell.label}-cancel`} />}
    </View>
  );
}

function SetupOutput({ input, label }: { input: Extract<CellInput, { kind: 'setup' }>; label: string }) {
  const eps = epsilonOf(input);
  const model = input.model.preset === 'custom' ? `\\text{${input.model.fields} fields}` : input.model.preset === 'on' ? `O(${input.model.N})` : `\\text{cubic},\\ N = ${input.model.N}`;
  const tex = `${model},\\quad d = ${input.d ?? 'd'},\\quad s = ${input.s ?? 's'},\\quad \\varepsilon = 2s - d${eps ? ` = ${eps}` : ''}`;
  return <CopyableFormula tex={tex} testID={`cell-${label}-parameters`} />;
}

function setupDOf(notebook: NotebookDetail, input: CellInput): string | undefined {
  if (!('uses' in input) || !input.uses) return undefined;
  const setup = notebook.cells.find((cell) => cell.label === input.uses)?.input;
  return setup?.kind === 'setup' ? setup.d : undefined;
}

function runFacts(run: RunView): string {
  const facts = [run.cached ? 'from the cache' : null, run.durationMs !== null ? `${(run.durationMs / 1000).toFixed(2)} s` : null, `engine ${run.engineVersion}`];
  return facts.filter(Boolean).join(' · ');
}

const styles = StyleSheet.create({
  output: { gap: spacing.sm, borderTopWidth: 1, borderTopColor: colors.rule, paddingTop: spacing.md },
  stale: { borderLeftWidth: 3, borderLeftColor: colors.amber, paddingLeft: spacing.md },
  staleLabel: { fontFamily: fonts.medium, fontSize: 12, color: colors.amberDeep },
  hint: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint },
  meta: { fontFamily: fonts.regular, fontSize: 12, color: colors.inkFaint },
});
