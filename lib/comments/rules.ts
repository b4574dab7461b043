/** What a line comment may hold (pure: the comment form and the store both import it). */
export const COMMENT_MAX = 2000;

/**
 * The comment as stored: line ends made uniform, control characters other than line ends and tabs
 * removed, surrounding blank space trimmed. Comments are plain text: they are shown as text, never
 * as markup, so `<b>` stays the four characters typed.
 */
export function cleanComment(text: string): string {
  let out = '';
  for (const ch of text.replace(/\r\n?/g, '\n')) {
    const c = ch.charCodeAt(0);
    if (c === 9 || c === 10 || (c >= 32 && c !== 127)) out += ch;
  }
  return out.trim();
}

/** A sentence saying what is wrong with the comment, or null when it may be posted. */
export function commentProblem(text: string): string | null {
  const t = cleanComment(text);
  if (!t) return 'Write the comment before posting it.';
  const n = [...t].length;
  if (n > COMMENT_MAX)
    return `A comment can be at most ${COMMENT_MAX.toLocaleString('en')} characters; this one has ${n.toLocaleString('en')}. Shorten it or split it into two.`;
  return null;
}
