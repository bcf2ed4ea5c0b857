import { Fragment, type ReactNode } from 'react';

const URL_PATTERN = /https?:\/\/[^\s<>"']+/g;
// Sentence punctuation right after a link belongs to the sentence, not to the address.
const TRAILING_PUNCTUATION = /[.,;:!?)\]}]+$/;

export type TextPart = { kind: 'text'; text: string } | { kind: 'link'; href: string };

/** Splits plain text into text and http(s) links. */
export function splitLinks(text: string): TextPart[] {
  const parts: TextPart[] = [];
  let last = 0;
  for (const match of text.matchAll(URL_PATTERN)) {
    const start = match.index;
    const href = match[0].replace(TRAILING_PUNCTUATION, '');
    if (start > last) parts.push({ kind: 'text', text: text.slice(last, start) });
    parts.push({ kind: 'link', href });
    last = start + href.length;
  }
  if (last < text.length) parts.push({ kind: 'text', text: text.slice(last) });
  return parts;
}

/** Plain text with its web addresses made clickable; never renders the text as HTML. */
export function LinkifiedText({ text }: { text: string }): ReactNode {
  return splitLinks(text).map((part, index) =>
    part.kind === 'link' ? (
      <a key={index} href={part.href} target="_self" className="break-all font-medium underline underline-offset-2">
        {part.href}
      </a>
    ) : (
      <Fragment key={index}>{part.text}</Fragment>
    ),
  );
}
