import { withGreekFace } from './greekFace';

/**
 * Rungbook's palette and type scale: ink on warm paper, amber for action, slate for structure. Every text
 * colour reaches WCAG AA (4.5:1) on the backgrounds it is used on (tests/unit/theme/contrast.test.ts).
 */
export const colors = {
  paper: '#F7F5EF',
  surface: '#FFFFFF',
  ink: '#1C2230',
  inkSoft: '#4A5266',
  inkFaint: '#646A7B',
  rule: '#E2DED3',
  /** Fills under white labels and short state words on paper; lines and marks keep the brighter plot amber. */
  amber: '#A35F1C',
  amberDeep: '#845111',
  amberWash: '#FBF1E2',
  slate: '#26324A',
  slateText: '#E9ECF2',
  danger: '#B23A3A',
  dangerWash: '#FBECEC',
  success: '#2F7A4F',
  successWash: '#E8F4EC',
} as const;

/**
 * Plot styles of series held against data: each variant has its own colour AND dash pattern, so lines stay
 * apart in print and for readers who do not tell the colours apart. Truncations are solid or dotted, Padé dashed.
 */
export const comparisonPlot = {
  truncated: [
    { color: '#26324A', dash: undefined },
    { color: '#2C7DA0', dash: '2 3' },
    { color: '#6B4FA0', dash: '1 2' },
  ],
  pade: [
    { color: '#C9822B', dash: '8 4' },
    { color: '#2F7A4F', dash: '12 3 3 3' },
    { color: '#B23A3A', dash: '5 5' },
    { color: '#7A5C2E', dash: '14 4' },
  ],
  data: '#7A8294',
  dataBand: '#EEF1F6',
  mark: '#845111',
  kink: '#B23A3A',
  zero: '#8A90A0',
} as const;

/**
 * Text face Inter; lowercase Greek (ν, η, ω, ε, …) comes from KaTeX's math italic, the face formulas use,
 * so ν never reads as v in tables, legends and chips (see greekFace.web.ts).
 */
export const fonts = {
  regular: withGreekFace('Inter_400Regular'),
  medium: withGreekFace('Inter_500Medium'),
  semibold: withGreekFace('Inter_600SemiBold'),
} as const;

export const spacing = { xs: 4, sm: 8, md: 12, lg: 16, xl: 24, xxl: 32 } as const;

/** Width from which the signed-in area shows a side rail instead of a bottom bar. */
export const WIDE_LAYOUT_MIN_WIDTH = 1024;
