import { useCallback, useLayoutEffect, useState, type RefObject } from 'react';
import { colors } from '../../constants/theme';

/**
 * Smallest scale a formula is set at before it scrolls sideways instead: at 0.7 of the text size KaTeX's
 * second-level indices are about 8 px on a phone, the least that still reads.
 */
export const MIN_FORMULA_SCALE = 0.7;

const fits = (box: HTMLElement) => box.scrollWidth <= box.clientWidth + 1;

/**
 * Sets `box` (whose content KaTeX sizes in em) at `baseEm`, then shrinks it until the content fits its
 * width, down to MIN_FORMULA_SCALE. True when it fits; false when it still needs to scroll sideways.
 */
export function fitToWidth(box: HTMLElement, baseEm: number): boolean {
  box.style.fontSize = `${baseEm}em`;
  let scale = 1;
  // Rules and paddings do not scale with the font, so one proportional step can fall a few px short.
  for (let step = 0; step < 4 && box.clientWidth > 0 && !fits(box) && scale > MIN_FORMULA_SCALE; step += 1) {
    scale = Math.max(MIN_FORMULA_SCALE, Math.floor(scale * (box.clientWidth / box.scrollWidth) * 100) / 100);
    box.style.fontSize = `${(baseEm * scale).toFixed(3)}em`;
  }
  return box.clientWidth === 0 || fits(box);
}

/**
 * Runs `fit` after each render of `content`, whenever the element changes size (its width, or its height
 * once KaTeX's stylesheet applies) and once the web fonts have loaded (KaTeX's glyphs change the content's
 * width). A fit that changes nothing leaves the size as it was, so the observer settles.
 */
export function useRefitOnResize(element: RefObject<HTMLElement | null>, content: string, fit: (element: HTMLElement) => void): void {
  useLayoutEffect(() => {
    const target = element.current;
    if (!target) return;
    let live = true;
    const refit = () => {
      if (live) fit(target);
    };
    refit();
    void document.fonts?.ready.then(refit);
    const observer = typeof ResizeObserver === 'undefined' ? null : new ResizeObserver(refit);
    observer?.observe(target);
    return () => {
      live = false;
      observer?.disconnect();
    };
  }, [element, content, fit]);
}

/** fitToWidth for one display formula, with whether it still scrolls sideways (then it shows a cue). */
export function useFittedFormula(box: RefObject<HTMLElement | null>, content: string, baseEm: number): boolean {
  const [scrolls, setScrolls] = useState(false);
  const fit = useCallback((element: HTMLElement) => setScrolls(!fitToWidth(element, baseEm)), [baseEm]);
  useRefitOnResize(box, content, fit);
  return scrolls;
}

/**
 * Fits every display formula KaTeX rendered inside `root` (notes and comments, whose HTML is written in
 * one piece); one that still does not fit scrolls sideways with a cue after it.
 */
export function fitDisplaysIn(root: HTMLElement): void {
  for (const display of Array.from(root.querySelectorAll<HTMLElement>('.katex-display'))) {
    const fitted = fitToWidth(display, 1);
    display.style.overflowX = fitted ? '' : 'auto';
    display.dataset.testid = 'display-formula-hscroll';
    const cue = display.nextElementSibling instanceof HTMLElement && display.nextElementSibling.dataset.testid === 'display-formula-cue' ? display.nextElementSibling : null;
    if (fitted) cue?.remove();
    else if (!cue) display.insertAdjacentHTML('afterend', `<span data-testid="display-formula-cue" style="display:block;font-size:12px;color:${colors.amberDeep}">Scroll sideways for the whole formula →</span>`);
  }
}
