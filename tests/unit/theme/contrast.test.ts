import assert from 'node:assert/strict';
import { test } from 'node:test';
import { colors, comparisonPlot } from '../../../constants/theme';

/**
 * WCAG 2.2, definitions "relative luminance" and "contrast ratio" (https://www.w3.org/TR/WCAG22/#dfn-relative-luminance,
 * #dfn-contrast-ratio): each sRGB channel c in [0, 1] is linearised as c/12.92 when c ≤ 0.04045, else
 * ((c + 0.055)/1.055)^2.4; L = 0.2126 R + 0.7152 G + 0.0722 B; the ratio is (L1 + 0.05)/(L2 + 0.05) with L1 the lighter.
 * Success criterion 1.4.3 (contrast, minimum, level AA) asks for 4.5:1 for text.
 */
function channel(byte: number): number {
  const c = byte / 255;
  return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
}

function relativeLuminance(hex: string): number {
  const value = Number.parseInt(hex.replace('#', ''), 16);
  return 0.2126 * channel((value >> 16) & 255) + 0.7152 * channel((value >> 8) & 255) + 0.0722 * channel(value & 255);
}

function contrastRatio(a: string, b: string): number {
  const [lighter, darker] = [relativeLuminance(a), relativeLuminance(b)].sort((x, y) => y - x);
  return (lighter + 0.05) / (darker + 0.05);
}

const AA_TEXT = 4.5;

test('the contrast formula gives the values WCAG states for its end points', () => {
  // black on white is 21:1 and any colour on itself 1:1 by the definition above
  assert.equal(contrastRatio('#000000', '#FFFFFF'), 21);
  assert.equal(contrastRatio('#4A5266', '#4A5266'), 1);
  // #767676 on white is the commonly quoted lightest grey that passes AA, 4.54:1 (recalled from memory)
  assert.equal(Number(contrastRatio('#767676', '#FFFFFF').toFixed(2)), 4.54);
});

const lightBackgrounds = { paper: colors.paper, surface: colors.surface, amberWash: colors.amberWash, dangerWash: colors.dangerWash, successWash: colors.successWash };

/** Text colours used on any light background (labels, hints, faint text, state words, errors). */
const textOnLight = { ink: colors.ink, inkSoft: colors.inkSoft, inkFaint: colors.inkFaint, amberDeep: colors.amberDeep, danger: colors.danger, success: colors.success, slate: colors.slate };

/** Pairs outside that grid: [where, text, background]. */
const otherPairs: [string, string, string][] = [
  ['primary buttons, accent chips and badges: white label on amber', colors.surface, colors.amber],
  ['selected chips, top bar and rail: slate text on slate', colors.slateText, colors.slate],
  ['state word "running" and "reconnecting" on paper', colors.amber, colors.paper],
  ['state word "running" on a cell card', colors.amber, colors.surface],
  ['plot mark labels (s = d/2, s*) on the plot', comparisonPlot.mark, colors.surface],
  ['plot mark labels inside the data band', comparisonPlot.mark, comparisonPlot.dataBand],
  ['plot tick labels inside the data band', colors.inkSoft, comparisonPlot.dataBand],
];

test('every text colour reaches 4.5:1 on every light background', () => {
  const failing: string[] = [];
  for (const [textName, text] of Object.entries(textOnLight)) {
    for (const [backgroundName, background] of Object.entries(lightBackgrounds)) {
      const ratio = contrastRatio(text, background);
      if (ratio < AA_TEXT) failing.push(`${textName} on ${backgroundName}: ${ratio.toFixed(2)}`);
    }
  }
  assert.deepEqual(failing, []);
});

test('text on fills, dark bars and inside plots reaches 4.5:1', () => {
  const failing = otherPairs.filter(([, text, background]) => contrastRatio(text, background) < AA_TEXT).map(([where, text, background]) => `${where}: ${contrastRatio(text, background).toFixed(2)}`);
  assert.deepEqual(failing, []);
});
