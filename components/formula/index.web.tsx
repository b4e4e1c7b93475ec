import { useMemo } from 'react';
import { ensureKatexStylesheet } from './katexStylesheet.web';
import { renderTex, type FormulaProps } from './renderTex';

/** Web: KaTeX renders straight into the DOM. */
export function Formula({ tex, display = false, label, testID }: FormulaProps) {
  ensureKatexStylesheet();
  const html = useMemo(() => renderTex(tex, display), [tex, display]);
  const Tag = display ? 'div' : 'span';
  // Wide display formulas scroll sideways on phones instead of overflowing the card.
  const style = display ? { overflowX: 'auto' as const, overflowY: 'hidden' as const, maxWidth: '100%' } : undefined;
  return <Tag role="math" aria-label={label ?? tex} data-testid={testID} style={style} dangerouslySetInnerHTML={{ __html: html }} />;
}
