import { withGreekFace } from '../../constants/greekFace';

/** The system monospace, with lowercase Greek from the math face in front (ν in a table never reads as v). */
export const monoFont = withGreekFace('ui-monospace, SFMono-Regular, Menlo, Consolas, monospace');
