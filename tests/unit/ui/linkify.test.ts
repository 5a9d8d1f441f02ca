// Links in captured plain-text mail, checked against the WHATWG URL parser (Node's global URL) as
// an independent judge of what an http(s) address is.
import { describe, expect, it } from 'vitest';
import { linkify } from '../../../src/features/mailbox/utils/linkify';

function rejoin(parts: ReturnType<typeof linkify>): string {
  return parts.map((part) => (part.kind === 'link' ? part.href : part.text)).join('');
}

describe('linkify', () => {
  it('finds the invitation link in a mail body and loses no character of the text', () => {
    const text =
      'Hello,\n\nAda Moreau invites you to join Lanternfish Studios.\n\nAccept within seven days:\n\nhttp://127.0.0.1:5480/invitations/EZmhAZ9Lj6FZyk5usa266uZhZKw4YpRVquN1Cn0gk18\n';
    const parts = linkify(text);
    expect(rejoin(parts)).toBe(text);
    const links = parts.filter((part) => part.kind === 'link');
    expect(links).toHaveLength(1);
    // WHATWG URL Standard: the link parses, with the path the mail carried.
    const url = new URL(links[0]!.kind === 'link' ? links[0]!.href : '');
    expect(url.pathname).toBe('/invitations/EZmhAZ9Lj6FZyk5usa266uZhZKw4YpRVquN1Cn0gk18');
  });

  it('leaves sentence punctuation and brackets outside the link', () => {
    const text =
      'Reset here: https://legwork.example/reset-password?token=abc123. Or (https://legwork.example/a/b), then stop!';
    const links = linkify(text).flatMap((part) => (part.kind === 'link' ? [part.href] : []));
    expect(links).toEqual([
      'https://legwork.example/reset-password?token=abc123',
      'https://legwork.example/a/b',
    ]);
    for (const href of links) expect(new URL(href).protocol).toBe('https:');
    expect(rejoin(linkify(text))).toBe(text);
  });

  it('makes no link of other schemes or of bare text', () => {
    const text = 'javascript:alert(1) mailto:a@b.example ftp://files.example plain words';
    expect(linkify(text)).toEqual([{ kind: 'text', text }]);
  });

  it('returns nothing for an empty body', () => {
    expect(linkify('')).toEqual([]);
  });
});
