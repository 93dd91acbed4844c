/**
 * The possessive of a name: "Dana's", but "Cinder & Slate Outdoor Works'" and "Gunnar Halvorsen's".
 * A name ending in s takes the apostrophe alone, as most house styles do for plural-looking names.
 */
export function possessive(name: string): string {
  const trimmed = name.trim();
  return /s$/i.test(trimmed) ? `${trimmed}'` : `${trimmed}'s`;
}
