import type { ReactNode } from 'react';

/** Web: raises the inherited font size, which KaTeX formulas scale with. */
export function LargeType({ children, size = 28 }: { children: ReactNode; size?: number }) {
  return <div style={{ fontSize: size, width: '100%' }}>{children}</div>;
}
