import { createContext, useContext } from 'react';

/**
 * True inside a presentation slide: results show what they computed and leave out their actions
 * (copy, save, show points, cancel), which are clutter on a projected screen.
 */
const PresentationModeContext = createContext(false);

export const PresentationModeProvider = PresentationModeContext.Provider;

export function usePresentationMode(): boolean {
  return useContext(PresentationModeContext);
}
