// Plain-text mail bodies carry the invitation and reset links; the mailbox page turns them into anchors.

export type TextPart = { kind: 'text'; text: string } | { kind: 'link'; href: string };

// Trailing punctuation usually closes the sentence, not the address.
const URL_PATTERN = /\bhttps?:\/\/[^\s<>"]+[^\s<>".,;:!?)\]'}]/g;

/** Splits plain text into text and http(s) link parts, in order, losing no character. */
export function linkify(text: string): TextPart[] {
  const parts: TextPart[] = [];
  let last = 0;
  for (const match of text.matchAll(URL_PATTERN)) {
    const start = match.index;
    if (start > last) parts.push({ kind: 'text', text: text.slice(last, start) });
    parts.push({ kind: 'link', href: match[0] });
    last = start + match[0].length;
  }
  if (last < text.length) parts.push({ kind: 'text', text: text.slice(last) });
  return parts;
}
