/**
 * @jest-environment jsdom
 */
import { render } from '@testing-library/react-native';
// The web variants, imported by file name (the component tests run with the native preset); their
// platform import of the Greek face is pointed at its web file too.
jest.mock('../../../constants/greekFace', () => jest.requireActual('../../../constants/greekFace.web'));
import { CommentBody } from '../../../components/comments/CommentBody.web';
import { monoFont } from '../../../components/notebook/monoFont.web';
import { NoteView } from '../../../components/notebook/NoteView.web';

/** The first family a browser tries for a character; CSS font-family lists are comma-separated. */
const firstFamily = (family: string) => family.split(',')[0].trim();

/** The inline style of the rendered div, as React Native's test renderer keeps it. */
function styleOf(tree: unknown): { fontFamily: string } {
  return (tree as { props: { style: { fontFamily: string } } }).props.style;
}

describe('lowercase Greek in notes, comments and monospace tables', () => {
  // The Greek face covers only U+03B1–03C9 and four variants (unicode-range), so a face listed first
  // draws ν, η, ω … and lets every other character fall through to the text face after it (CSS Fonts 4, §4.5).
  it('puts the Greek face first in the monospace used by tables', () => {
    expect(firstFamily(monoFont)).toBe('RungbookGreek');
    expect(monoFont).toContain('monospace');
  });

  it('uses the theme text face with the Greek face in front in notes and comments', () => {
    const note = styleOf(render(<NoteView text="Δσ and ν" />).toJSON());
    const comment = styleOf(render(<CommentBody text="ν, not v" />).toJSON());
    for (const style of [note, comment]) {
      expect(style.fontFamily.split(',').map((family) => family.trim()).slice(0, 2)).toEqual(['RungbookGreek', 'Inter_400Regular']);
    }
  });
});
