import Svg, { Rect } from 'react-native-svg';
import { colors } from '../../constants/theme';

/** The Rungbook mark: two rails and three amber rungs. */
export function RungMark({ size = 24 }: { size?: number }) {
  return (
    <Svg width={size} height={size} viewBox="0 0 24 24" accessibilityLabel="Rungbook">
      <Rect x={4} y={2} width={2.5} height={20} rx={1} fill={colors.slateText} />
      <Rect x={17.5} y={2} width={2.5} height={20} rx={1} fill={colors.slateText} />
      <Rect x={6.5} y={5} width={11} height={2.5} fill={colors.amber} />
      <Rect x={6.5} y={10.75} width={11} height={2.5} fill={colors.amber} />
      <Rect x={6.5} y={16.5} width={11} height={2.5} fill={colors.amber} />
    </Svg>
  );
}
