/**
 * Scan plots as LaTeX picture-mode figures: plain LaTeX draws them (no graphics package, no file next
 * to the .tex). Straight segments of any slope are \qbezier curves with their control point in the
 * middle (picture mode's \line only takes a few slopes). The legend sits under the axes, never on a curve.
 */
export interface PlotCurve {
  /** Legend text (already TeX). */
  label: string;
  points: { x: number; y: number }[];
  dashed?: boolean;
}

export interface PlotSpec {
  xLabel: string;
  yLabel: string;
  curves: PlotCurve[];
  /** Vertical marks inside the x-range (e.g. s*), with their TeX label. */
  marks: { x: number; label: string }[];
}

const WIDTH = 170;
const HEIGHT = 110;
const DASH = 3;

/** Ticks at 1, 2 or 5 times a power of ten, four to six of them. */
export function niceTicks(low: number, high: number): number[] {
  const span = high - low || Math.abs(high) || 1;
  const raw = span / 5;
  const power = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((m) => m * power).find((candidate) => candidate >= raw) ?? 10 * power;
  const ticks: number[] = [];
  for (let k = Math.ceil(low / step - 1e-9); k * step <= high + step * 1e-9; k++) ticks.push(Number((k * step).toPrecision(12)));
  return ticks;
}

const fixed = (value: number) => Number(value.toFixed(2));

function segment(from: [number, number], to: [number, number]): string {
  const middle: [number, number] = [(from[0] + to[0]) / 2, (from[1] + to[1]) / 2];
  return `\\qbezier(${fixed(from[0])},${fixed(from[1])})(${fixed(middle[0])},${fixed(middle[1])})(${fixed(to[0])},${fixed(to[1])})`;
}

/** A dashed segment: pieces of DASH points with gaps of the same length. */
function dashedSegment(from: [number, number], to: [number, number]): string[] {
  const length = Math.hypot(to[0] - from[0], to[1] - from[1]);
  const pieces = Math.max(1, Math.floor(length / DASH));
  const at = (t: number): [number, number] => [from[0] + t * (to[0] - from[0]), from[1] + t * (to[1] - from[1])];
  const drawn: string[] = [];
  for (let k = 0; k < pieces; k += 2) drawn.push(segment(at(k / pieces), at(Math.min(1, (k + 1) / pieces))));
  return drawn;
}

const tickText = (value: number) => `\\scriptsize$${String(value).replace(/^-/, '-')}$`;

function axes(xTicks: number[], yTicks: number[], toX: (x: number) => number, toY: (y: number) => number): string[] {
  const frame = [`\\put(0,0){\\framebox(${WIDTH},${HEIGHT}){}}`];
  const xs = xTicks.flatMap((x) => [`\\put(${fixed(toX(x))},0){\\line(0,1){3}}`, `\\put(${fixed(toX(x))},-4){\\makebox(0,0)[t]{${tickText(x)}}}`]);
  const ys = yTicks.flatMap((y) => [`\\put(0,${fixed(toY(y))}){\\line(1,0){3}}`, `\\put(-3,${fixed(toY(y))}){\\makebox(0,0)[r]{${tickText(y)}}}`]);
  return [...frame, ...xs, ...ys];
}

function legend(curves: PlotCurve[]): string[] {
  return curves.flatMap((curve, index) => {
    const y = -24 - 9 * index;
    const sample = curve.dashed ? dashedSegment([0, y], [18, y]) : [segment([0, y], [18, y])];
    return [...sample, `\\put(22,${y}){\\makebox(0,0)[l]{\\footnotesize ${curve.label}}}`];
  });
}

/** One plot as a picture environment (its width is WIDTH plus room for the tick labels). */
export function plotPicture(spec: PlotSpec): string {
  const all = spec.curves.flatMap((curve) => curve.points).filter((p) => Number.isFinite(p.x) && Number.isFinite(p.y));
  if (all.length < 2) return '';
  const [xLow, xHigh] = [Math.min(...all.map((p) => p.x)), Math.max(...all.map((p) => p.x))];
  const yTicks = niceTicks(Math.min(...all.map((p) => p.y)), Math.max(...all.map((p) => p.y)));
  const [yLow, yHigh] = [Math.min(yTicks[0], ...all.map((p) => p.y)), Math.max(yTicks[yTicks.length - 1], ...all.map((p) => p.y))];
  const toX = (x: number) => ((x - xLow) / (xHigh - xLow || 1)) * WIDTH;
  const toY = (y: number) => ((y - yLow) / (yHigh - yLow || 1)) * HEIGHT;
  const xTicks = niceTicks(xLow, xHigh).filter((x) => x >= xLow - 1e-12 && x <= xHigh + 1e-12);
  const lines = spec.curves.flatMap((curve) => {
    const points = curve.points.filter((p) => Number.isFinite(p.x) && Number.isFinite(p.y)).map((p): [number, number] => [toX(p.x), toY(p.y)]);
    return points.slice(1).flatMap((to, index) => (curve.dashed ? dashedSegment(points[index], to) : [segment(points[index], to)]));
  });
  const marks = spec.marks
    .filter((mark) => mark.x >= xLow && mark.x <= xHigh)
    .flatMap((mark) => [...dashedSegment([toX(mark.x), 0], [toX(mark.x), HEIGHT]), `\\put(${fixed(toX(mark.x))},${HEIGHT + 3}){\\makebox(0,0)[b]{\\scriptsize ${mark.label}}}`]);
  const rows = spec.curves.length;
  return [
    `\\begin{picture}(${WIDTH + 32},${HEIGHT + 44 + 9 * rows})(-30,${-30 - 9 * rows})`,
    '\\thicklines',
    ...axes(xTicks, yTicks, toX, toY),
    `\\put(${WIDTH / 2},-13){\\makebox(0,0)[t]{\\small ${spec.xLabel}}}`,
    `\\put(0,${HEIGHT + 3}){\\makebox(0,0)[bl]{\\small ${spec.yLabel}}}`,
    ...lines,
    ...marks,
    ...legend(spec.curves),
    '\\end{picture}',
  ].join('\n');
}
