/**
 * Readability of generated text, measured with independent packages from the npm
 * registry: `syllable` counts syllables, `flesch` and `flesch-kincaid` apply the
 * formulas (Flesch 1948; Kincaid et al. 1975). Test-only: core itself does not
 * depend on these packages.
 *
 * Our part is only splitting text into sentences and words. Numbers are read the
 * way they are spoken ("$4,800" → "four thousand eight hundred dollars") and
 * counted as one written word with all of those syllables, which is stricter than
 * counting each spoken word.
 */
import { flesch } from 'flesch';
import { fleschKincaid } from 'flesch-kincaid';
import { syllable } from 'syllable';

const ones = [
  'zero',
  'one',
  'two',
  'three',
  'four',
  'five',
  'six',
  'seven',
  'eight',
  'nine',
  'ten',
  'eleven',
  'twelve',
  'thirteen',
  'fourteen',
  'fifteen',
  'sixteen',
  'seventeen',
  'eighteen',
  'nineteen',
];
const tens = ['', '', 'twenty', 'thirty', 'forty', 'fifty', 'sixty', 'seventy', 'eighty', 'ninety'];

/** Spell out a whole number the way it is read aloud. */
export function numberInWords(value: number): string {
  if (value < 20) return ones[value] ?? '';
  if (value < 100) return `${tens[Math.floor(value / 10)]}${value % 10 ? ` ${ones[value % 10]}` : ''}`;
  if (value < 1000) return `${ones[Math.floor(value / 100)]} hundred${value % 100 ? ` ${numberInWords(value % 100)}` : ''}`;
  if (value < 1_000_000)
    return `${numberInWords(Math.floor(value / 1000))} thousand${value % 1000 ? ` ${numberInWords(value % 1000)}` : ''}`;
  return `${numberInWords(Math.floor(value / 1_000_000))} million${value % 1_000_000 ? ` ${numberInWords(value % 1_000_000)}` : ''}`;
}

export type Counts = { sentence: number; word: number; syllable: number };

function syllablesOfToken(token: string): number {
  const money = token.startsWith('$');
  const bare = token
    .replace(/^\$/, '')
    .replace(/[.,;:!?)"”’']+$/, '')
    .replace(/^[("“‘']+/, '');
  if (/^\d[\d,]*(\.\d+)?$/.test(bare)) {
    const [whole, fraction] = bare.replace(/,/g, '').split('.');
    let spoken = numberInWords(Number(whole));
    if (fraction) spoken += ` point ${[...fraction].map((d) => ones[Number(d)]).join(' ')}`;
    if (money) spoken += ' dollars';
    return syllable(spoken);
  }
  return Math.max(1, syllable(bare));
}

export function countText(text: string): Counts {
  const sentences = text
    .split(/(?<=[.!?])\s+/)
    .map((s) => s.trim())
    .filter((s) => /[A-Za-z0-9]/.test(s));
  const words = text.split(/\s+/).filter((w) => /[A-Za-z0-9]/.test(w));
  const syllables = words.reduce((sum, w) => sum + syllablesOfToken(w), 0);
  return { sentence: sentences.length, word: words.length, syllable: syllables };
}

export function readability(text: string): { ease: number; grade: number; counts: Counts } {
  const counts = countText(text);
  return { ease: flesch({ ...counts }), grade: fleschKincaid({ ...counts }), counts };
}
