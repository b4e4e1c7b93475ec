import { Component, type ReactNode } from 'react';
import type { CellKind } from '../../../shared/notebook';
import { asComparison, asExponents, asFixedPoints, asScan, asSeries, isObject } from '../resultShapes';
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

function KnownResult({ kind, result, label, setupD, show, dataName }: ResultViewProps) {
  const testID = `cell-${label}-result`;
  if (kind === 'integral') {
    const series = asSeries(result);
    if (series) return <SeriesOutput series={series} name={`I_{\\mathrm{${label.replace(/_/g, '\\_')}}}`} fileName={label} testID={testID} />;
  }
  if (kind === 'exponents') {
    const exponents = asExponents(result);
    if (exponents) return <ExponentsOutput result={exponents} fileName={label} testID={testID} />;
  }
  if (kind === 'flow' && isObject(result) && isObject(result.beta)) return <FlowOutput result={result} fileName={label} testID={testID} />;
  if (kind === 'fixedpoints') {
    const fixedPoints = asFixedPoints(result);
    if (fixedPoints) return <FixedPointsOutput eps={fixedPoints.eps} points={fixedPoints.points} fileName={label} testID={testID} />;
  }
  if (kind === 'scan') {
    const scan = asScan(result, setupD);
    if (scan) return <ScanOutput scan={scan} fileName={label} testID={testID} />;
  }
  if (kind === 'comparison') {
    const comparison = asComparison(result);
    if (comparison) return <ComparisonOutput result={comparison} show={show} dataName={dataName} fileName={label} testID={testID} />;
  }
  if (result !== null && typeof result === 'object') return <StructuredResult value={result} fileName={label} />;
  return <JsonBlock value={result} testID={`cell-${label}-json`} />;
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
