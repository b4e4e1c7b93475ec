import { useWindowDimensions } from 'react-native';
import { WIDE_LAYOUT_MIN_WIDTH } from '../constants/theme';

export function useWideLayout(): boolean {
  return useWindowDimensions().width >= WIDE_LAYOUT_MIN_WIDTH;
}
