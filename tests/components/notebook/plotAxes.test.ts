import { scaleLinear } from 'd3-scale';
import { plotGeometry, plotSvg } from '../../../components/notebook/outputs/plotGeometry';
import { axesSvg, axisFrame, tickLabel } from '../../../components/notebook/plotAxes';
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

const margin = { top: 16, right: 16, bottom: 40, left: 64 };

test('axisFrame places the plot area inside the margins and ticks the x axis every 0.1', () => {
  const x = scaleLinear().domain([1.5, 2]).range([64, 400 - 16]);
  const y = scaleLinear().domain([0, 1]).range([280 - 40, 16]);
  const frame = axisFrame(x, y, 400, 280, margin, { x: 's', y: '' });
  expect([frame.plotLeft, frame.plotRight, frame.plotTop, frame.plotBottom]).toEqual([64, 384, 16, 240]);
  // 320 px of plot: 320/80 = 4 ticks asked for; 0.5/4 = 0.125 rounds to a step of 0.1 (d3's 1-2-5 steps), so 1.5, 1.6, …, 2;
  // 1.6 sits a fifth of the way along: 64 + 320/5 = 128
  expect(frame.xTicks.map((tick) => tickLabel(tick.value))).toEqual(['1.5', '1.6', '1.7', '1.8', '1.9', '2']);
  expect(frame.xTicks[1].at).toBeCloseTo(128, 9);
});

test('tick labels drop floating-point noise: 0.1 + 0.2 prints as 0.3', () => {
  expect(tickLabel(0.1 + 0.2)).toBe('0.3');
});

test('a scan’s saved SVG draws its axes with the shared axis code, and an empty y title is left out', () => {
  // invented values
  const scan = asScan({ d: '3', fixedPoint: null, notices: [], quantities: ['nuInv'], marks: { meanFieldEnd: '1.5', meanFieldEndNote: '' }, points: [{ s: '1.6', eps: '0.2', regime: 'long-range', flagged: false, values: { nuInv: '1.5' }, pade: {} }, { s: '1.8', eps: '0.6', regime: 'long-range', flagged: false, values: { nuInv: '1.55' }, pade: {} }] })!;
  const geometry = plotGeometry(scan, 400, 280);
  const svg = plotSvg(geometry);
  for (const element of axesSvg(geometry)) expect(svg).toContain(element);
  expect(svg).not.toContain('rotate(-90');
  expect(svg).toContain('>s</text>');
});
