import type { ReactNode } from 'react';
import { View } from 'react-native';

/** Native: formulas size themselves in their web views; text sizes are set where the text is. */
export function LargeType({ children }: { children: ReactNode; size?: number }) {
  return <View style={{ width: '100%' }}>{children}</View>;
}
