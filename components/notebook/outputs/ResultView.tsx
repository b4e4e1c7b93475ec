import { Component, type ReactNode } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../../constants/theme';
import type { CellKind } from '../../../shared/notebook';
import { asComparison, asExponents, asFixedPoints, asFlow, asScan, asSeries } from '../resultShapes';
import { ComparisonOutput } from './ComparisonOutput';
import { FixedPointsOutput } from './FixedPointsOutput';
import { FlowOutput } from './FlowOutput';
import { ExponentsOutput } from './ExponentsOutput';
import { JsonBlock } from './JsonBlock';
import { ScanOutput } from './ScanOutput';
import { SeriesOutput } from './SeriesOutput';
import { StructuredResult } from './StructuredResult';

interface ResultViewProps {
  kind: CellKind;
  result: unknown;
  label: string;
  /** d of the setup cell, for marking s = d/2 in scans. */
  setupD?: string;
  /** A comparison's data drawn as points or as a boundary line (the cell's choice, else the dataset's shape). */
  show?: 'points' | 'boundary';
  /** The compared dataset's name, for the legend. */
  dataName?: string;
}

/** The finished result of a cell in the view its shape calls for; unknown shapes as JSON. */
export function ResultView(props: ResultViewProps) {
  return (
    <ResultBoundary fallback={<JsonBlock value={props.result} testID={`cell-${props.label}-json`} />}>
      <KnownResult {...props} />
    </ResultBoundary>
  );
}

/** Each result is read with its job's result schema (components/notebook/resultShapes.ts); what no schema reads is shown field by field. */
function KnownResult({ kind, result, label, setupD, show, dataName }: ResultViewProps) {
  const testID = `cell-${label}-result`;
  const view = knownView({ kind, result, label, setupD, show, dataName }, testID);
  if (view) return view.earlier ? <EarlierResult label={label}>{view.node}</EarlierResult> : view.node;
  if (result !== null && typeof result === 'object') return <StructuredResult value={result} fileName={label} />;
  return <JsonBlock value={result} testID={`cell-${label}-json`} />;
}

function knownView({ kind, result, label, setupD, show, dataName }: ResultViewProps, testID: string): { node: ReactNode; earlier: boolean } | null {
  switch (kind) {
    case 'integral': {
      const series = asSeries(result);
      return series ? { node: <SeriesOutput series={series} name={`I_{\\mathrm{${label.replace(/_/g, '\\_')}}}`} fileName={label} testID={testID} />, earlier: !!series.earlier } : null;
    }
    case 'exponents': {
      const exponents = asExponents(result);
      return exponents ? { node: <ExponentsOutput result={exponents} fileName={label} testID={testID} />, earlier: exponents.earlier } : null;
    }
    case 'flow': {
      const flow = asFlow(result);
      return flow ? { node: <FlowOutput result={flow.result} fileName={label} testID={testID} />, earlier: flow.earlier } : null;
    }
    case 'fixedpoints': {
      const fixedPoints = asFixedPoints(result);
      return fixedPoints ? { node: <FixedPointsOutput eps={fixedPoints.eps} points={fixedPoints.points} fileName={label} testID={testID} />, earlier: fixedPoints.earlier } : null;
    }
    case 'scan': {
      const scan = asScan(result, setupD);
      return scan ? { node: <ScanOutput scan={scan} result={result} fileName={label} testID={testID} />, earlier: !!scan.earlier } : null;
    }
    case 'comparison': {
      const comparison = asComparison(result);
      return comparison ? { node: <ComparisonOutput result={comparison} show={show} dataName={dataName} fileName={label} testID={testID} />, earlier: false } : null;
    }
    default:
      return null;
  }
}

/** A result that does not have the shape today's engine writes (an earlier engine version wrote it): shown as far as it can be read. */
function EarlierResult({ label, children }: { label: string; children: ReactNode }) {
  return (
    <View style={styles.earlier}>
      <Text style={styles.caption} testID={`cell-${label}-earlier`}>
        This result has an earlier shape than the engine writes today; parts may be missing. Run the cell again for the full view.
      </Text>
      {children}
    </View>
  );
}

class ResultBoundary extends Component<{ fallback: ReactNode; children: ReactNode }, { failed: boolean }> {
  state = { failed: false };
  static getDerivedStateFromError() {
    return { failed: true };
  }
  render() {
    return this.state.failed ? this.props.fallback : this.props.children;
  }
}

const styles = StyleSheet.create({
  earlier: { gap: spacing.sm },
  caption: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint },
});
