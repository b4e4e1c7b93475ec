import { useMemo, useRef } from 'react';
import { colors, fonts } from '../../constants/theme';
import { useFittedFormula } from './fitWidth';
import { ensureKatexStylesheet } from './katexStylesheet.web';
import { renderTex, renderWrappingDisplay, type FormulaProps } from './renderTex';

/**
 * Web: KaTeX renders straight into the DOM. A display formula breaks across lines at + and −; what cannot
 * break (a fraction, a matrix) is set smaller until it fits, and below MIN_FORMULA_SCALE it scrolls inside
 * its own box behind a visible cue rather than widening the card.
 */
export function Formula({ tex, display = false, label, testID }: FormulaProps) {
  ensureKatexStylesheet();
  const html = useMemo(() => (display ? renderWrappingDisplay(tex) : renderTex(tex, false)), [tex, display]);
  const box = useRef<HTMLDivElement>(null);
  const scrolls = useFittedFormula(box, html, DISPLAY_EM);
  if (!display) return <span role="math" aria-label={label ?? tex} data-testid={testID} dangerouslySetInnerHTML={{ __html: html }} />;
  const prefix = testID ?? 'formula';
  return (
    <div role="math" aria-label={label ?? tex} data-testid={testID} style={OUTER_STYLE}>
      <div ref={box} data-formula="display" data-testid={`${prefix}-hscroll`} style={DISPLAY_STYLE} dangerouslySetInnerHTML={{ __html: html }} />
      {scrolls ? <span data-testid={`${prefix}-cue`} style={CUE_STYLE}>Scroll sideways for the whole formula →</span> : null}
    </div>
  );
}

const DISPLAY_EM = 1.05;
const OUTER_STYLE = { maxWidth: '100%', minWidth: 0 } as const;
const DISPLAY_STYLE = { overflowX: 'auto', overflowY: 'hidden', maxWidth: '100%', lineHeight: 1.9, fontSize: `${DISPLAY_EM}em`, padding: '2px 0' } as const;
const CUE_STYLE = { display: 'block', fontFamily: fonts.medium, fontSize: 12, color: colors.amberDeep } as const;
