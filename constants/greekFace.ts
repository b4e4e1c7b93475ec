/**
 * Native builds take a font family by a single name: Greek letters come from the text face there.
 * The web build (greekFace.web.ts) puts the math face in front of it for Greek letters only.
 */
export const withGreekFace = (family: string): string => family;

export function installGreekFace(): void {}
