import { useMemo } from 'react';
import { ensureKatexStylesheet } from './katexStylesheet.web';
import { renderTex, renderWrappingDisplay, type FormulaProps } from './renderTex';

/** Web: KaTeX renders straight into the DOM; a display formula breaks across lines at + and − instead of overflowing. */
export function Formula({ tex, display = false, label, testID }: FormulaProps) {
  ensureKatexStylesheet();
  const html = useMemo(() => (display ? renderWrappingDisplay(tex) : renderTex(tex, false)), [tex, display]);
  if (!display) return <span role="math" aria-label={label ?? tex} data-testid={testID} dangerouslySetInnerHTML={{ __html: html }} />;
  // What cannot break (a wide array) scrolls inside the formula's own box rather than widening the card.
  return <div role="math" aria-label={label ?? tex} data-testid={testID} data-formula="display" style={DISPLAY_STYLE} dangerouslySetInnerHTML={{ __html: html }} />;
}

const DISPLAY_STYLE = { overflowX: 'auto', overflowY: 'hidden', maxWidth: '100%', lineHeight: 1.9, fontSize: '1.05em', padding: '2px 0' } as const;
