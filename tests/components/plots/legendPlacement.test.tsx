import { fireEvent, render } from '@testing-library/react-native';
import { followedCaption, followedRuns, plotGeometry, plotSvg } from '../../../components/notebook/outputs/plotGeometry';
import { ScanPlot } from '../../../components/notebook/outputs/ScanPlot';
import { legendBelow, svgLabel } from '../../../components/notebook/plotSvg';
import { asScan } from '../../../components/notebook/resultShapes';

// d3 ships as ES modules, which jest does not transform here; its UMD bundles are the same library as plain CommonJS.
jest.mock('d3-scale', () => jest.requireActual(`${process.cwd()}/node_modules/d3-scale/dist/d3-scale.js`));
jest.mock('d3-array', () => jest.requireActual(`${process.cwd()}/node_modules/d3-array/dist/d3-array.js`));
jest.mock('d3-interpolate', () => jest.requireActual(`${process.cwd()}/node_modules/d3-interpolate/dist/d3-interpolate.js`));
jest.mock('d3-color', () => jest.requireActual(`${process.cwd()}/node_modules/d3-color/dist/d3-color.js`));
jest.mock('d3-format', () => jest.requireActual(`${process.cwd()}/node_modules/d3-format/dist/d3-format.js`));
jest.mock('d3-time', () => jest.requireActual(`${process.cwd()}/node_modules/d3-time/dist/d3-time.js`));
jest.mock('d3-time-format', () => jest.requireActual(`${process.cwd()}/node_modules/d3-time-format/dist/d3-time-format.js`));
jest.mock('d3-shape', () => jest.requireActual(`${process.cwd()}/node_modules/d3-shape/dist/d3-shape.js`));
jest.mock('d3-path', () => jest.requireActual(`${process.cwd()}/node_modules/d3-path/dist/d3-path.js`));

/** Invented values: three points of s, the followed fixed point changes from "cubic" to "O(2)" between 1.7 and 1.8. */
function scanResult(names: (string | null)[]) {
  return {
    d: '3',
    fixedPoint: null,
    notices: [],
    quantities: ['nuInv', 'omega'],
    marks: { meanFieldEnd: '1.5', meanFieldEndNote: '' },
    points: ['1.6', '1.7', '1.8'].map((s, i) => ({ s, eps: '0', regime: 'long-range', flagged: false, fixedPoint: names[i], values: { nuInv: String(1.5 + i / 10), omega: String(0.2 * i) }, pade: {} })),
  };
}

test('the scan legend sits in rows below the picture, outside the plot area, at hand-computed places', () => {
  const geometry = plotGeometry(asScan(scanResult(['cubic', 'cubic', 'cubic']))!, 400, 280);
  const { slots, height } = legendBelow([{ label: '1/ν', style: { color: '#000' } }, { label: 'ω', style: { color: '#000' } }], geometry);
  // plotLeft = 64 (scan margin); "1/ν" spans 24 + 6 + 3·6.5 = 49.5, then 16 apart: the second entry starts at 64 + 49.5 + 16 = 129.5
  expect(slots.map((slot) => slot.x)).toEqual([64, 129.5]);
  // one row, baseline 14 below the picture's height (280), 18 + 8 = 26 px of room
  expect(slots.map((slot) => slot.y)).toEqual([294, 294]);
  expect(height).toBe(26);
  for (const slot of slots) expect(slot.y - 11).toBeGreaterThan(geometry.plotBottom);
});

test('a long legend wraps to the width of the picture instead of running past it', () => {
  const entries = Array.from({ length: 6 }, (_, i) => ({ label: `[${i}/1] Padé approximant of 1/ν`, style: { color: '#000' } }));
  const { slots } = legendBelow(entries, { width: 390, height: 280, plotLeft: 64 });
  // each entry spans 24 + 6 + 28·6.5 = 212 px: from x = 64 only one fits before 390 − 8 = 382, so one entry per row
  expect(new Set(slots.map((slot) => slot.y)).size).toBe(6);
  for (const slot of slots) expect(slot.x).toBe(64);
});

test('the saved SVG grows by the legend and draws every legend label below the plot area', () => {
  const geometry = plotGeometry(asScan(scanResult(['cubic', 'cubic', 'cubic']))!, 400, 280);
  const svg = plotSvg(geometry);
  // caption row + one legend row: 2·18 + 8 = 44 px more than the 280 px plot
  expect(svg).toContain('height="324"');
  const legendBaselines = [...svg.matchAll(/<text x="[\d.]+" y="([\d.]+)" fill="#1C2230">/g)].map((match) => Number(match[1]));
  expect(legendBaselines.length).toBe(2);
  for (const y of legendBaselines) expect(y).toBeGreaterThan(280);
});

test('the plot names the fixed point it follows and marks where it changes', () => {
  const scan = asScan(scanResult(['cubic', 'cubic', 'O(2)']))!;
  expect(followedRuns(scan)).toEqual([
    { name: 'cubic', from: 1.6, to: 1.7 },
    { name: 'O(2)', from: 1.8, to: 1.8 },
  ]);
  expect(followedCaption(followedRuns(scan))).toBe('Follows cubic (s 1.6–1.7), then O(2) (s 1.8)');
  const geometry = plotGeometry(scan, 400, 280);
  // x maps [1.6, 1.8] onto [64, 384]; the change sits at s = 1.75, three quarters along: 64 + 0.75·320 = 304
  expect(geometry.changes).toEqual([{ x: 304, label: '→ O(2)' }]);
  expect(followedCaption(followedRuns(asScan(scanResult(['cubic', 'cubic', 'cubic']))!))).toBe('Follows the cubic fixed point');
});

test('each scan point carries the fixed point it follows, falling back to the scan\'s, also in an earlier-shape result', () => {
  expect(asScan(scanResult(['cubic', null, 'O(2)']))!.points.map((point) => point.fixedPoint)).toEqual(['cubic', null, 'O(2)']);
  // An earlier-shape result (no notices, no regime) naming only the scan's fixed point: every point follows it.
  const earlier = { d: '3', fixedPoint: 'Wilson-Fisher', quantities: ['nuInv'], points: [{ s: '1.6', values: { nuInv: '1.5' } }, { s: '1.7', values: { nuInv: '1.6' } }] };
  const scan = asScan(earlier)!;
  expect(scan.earlier).toBe(true);
  expect(scan.points.map((point) => point.fixedPoint)).toEqual(['Wilson-Fisher', 'Wilson-Fisher']);
  expect(followedCaption(followedRuns(scan))).toBe('Follows the Wilson-Fisher fixed point');
});

test('Greek letters in saved labels take the math face; Latin letters stay in the text face', () => {
  expect(svgLabel('1/ν vs v')).toBe(`1/<tspan font-family="KaTeX_Math, 'Latin Modern Math', 'STIX Two Math', 'Cambria Math', serif" font-style="italic">ν</tspan> vs v`);
});

test('on screen the legend is a row below the canvas, and the followed fixed point is named above it', () => {
  const screen = render(<ScanPlot scan={asScan(scanResult(['cubic', 'cubic', 'O(2)']))!} fileName="scan" testID="scan" />);
  fireEvent(screen.getByTestId('scan-canvas'), 'layout', { nativeEvent: { layout: { x: 0, y: 0, width: 400, height: 280 } } });
  expect(screen.getByTestId('scan-followed')).toHaveTextContent('Follows cubic (s 1.6–1.7), then O(2) (s 1.8)');
  const wrap = screen.getByTestId('scan');
  const order = wrap.props.children.filter(Boolean).map((child: { props: { testID?: string } }) => child.props.testID);
  expect(order.indexOf('scan-canvas')).toBeLessThan(order.indexOf('scan-legend'));
  expect(screen.getByTestId('scan-legend')).toHaveTextContent(/1\/ν/);
});
