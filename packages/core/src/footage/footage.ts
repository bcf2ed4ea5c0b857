/**
 * Distances along a sewer line ("footage"), read from the camera's cable counter.
 *
 * Stored as ONE integer unit: tenths of a millimetre. With the international foot
 * and inch (1 in = 25.4 mm, 1 ft = 0.3048 m exactly; NIST SP 811, NOAA NGS) that
 * makes 1 in = 254 units, 1 ft = 3048 units and 1 m = 10 000 units, so every
 * whole inch and every whole millimetre is stored with no rounding at all.
 * The US survey foot (1200/3937 m) is retired and is not used here (NOAA NGS).
 */

/** A distance in integer tenths of a millimetre. */
export type Footage = number;

export const UNITS_PER_MM = 10;
/** 1 in = 25.4 mm exactly (NIST SP 811). */
export const UNITS_PER_INCH = 254;
/** 1 ft = 12 in = 0.3048 m exactly (NIST SP 811, international foot of 1959). */
export const UNITS_PER_FOOT = 3048;
export const UNITS_PER_METRE = 10_000;

/** Longest distance accepted: 2,000 ft, far past any push-camera cable (common practice, no source). */
export const MAX_FOOTAGE_FEET = 2000;
export const MAX_FOOTAGE: Footage = MAX_FOOTAGE_FEET * UNITS_PER_FOOT;

export type UnitSystem = 'imperial' | 'metric';

export const feet = (value: number): Footage => Math.round(value * UNITS_PER_FOOT);
export const inches = (value: number): Footage => Math.round(value * UNITS_PER_INCH);
export const metres = (value: number): Footage => Math.round(value * UNITS_PER_METRE);
export const feetAndInches = (ft: number, inch: number): Footage => ft * UNITS_PER_FOOT + Math.round(inch * UNITS_PER_INCH);

export const toFeet = (units: Footage): number => units / UNITS_PER_FOOT;
export const toInches = (units: Footage): number => units / UNITS_PER_INCH;
export const toMetres = (units: Footage): number => units / UNITS_PER_METRE;

export type FootageParseResult = { ok: true; value: Footage } | { ok: false; error: string };

export class FootageError extends Error {
  override name = 'FootageError';
}

const EXAMPLES = `52' 7", 52 ft 7 in, 52.6 ft or 16 m`;

type Unit = 'ft' | 'in' | 'm' | 'cm' | 'mm';

const unitWords: Record<string, Unit> = {
  "'": 'ft',
  ft: 'ft',
  feet: 'ft',
  foot: 'ft',
  '"': 'in',
  in: 'in',
  inch: 'in',
  inches: 'in',
  m: 'm',
  metre: 'm',
  metres: 'm',
  meter: 'm',
  meters: 'm',
  cm: 'cm',
  mm: 'mm',
};

/** A non-negative decimal as an exact fraction: "52.6" → 526/10. */
interface Decimal {
  numerator: number;
  denominator: number;
}

type Token = { type: 'number'; value: Decimal; text: string } | { type: 'unit'; unit: Unit } | { type: 'minus' };

function normalise(text: string): string {
  return (
    text
      .trim()
      .toLowerCase()
      // prime marks and typographic quotes people paste from phones and documents
      .replace(/[′’‘`´]/g, "'")
      .replace(/[″“”]/g, '"')
      .replace(/''/g, '"')
      .replace(/\u2212/g, '-')
      .replace(/\s+/g, ' ')
  );
}

function parseDecimal(text: string): Decimal | null {
  // "1,000" is a thousands separator; "16,5" is a decimal comma
  const thousands = /^(\d{1,3}),(\d{3})$/.exec(text);
  if (thousands) return { numerator: Number(`${thousands[1]}${thousands[2]}`), denominator: 1 };
  const match = /^(\d{1,6})(?:[.,](\d{1,4}))?$/.exec(text);
  if (!match) return null;
  const whole = match[1] ?? '0';
  const fraction = match[2] ?? '';
  const denominator = 10 ** fraction.length;
  return { numerator: Number(whole) * denominator + Number(fraction || '0'), denominator };
}

function tokenise(text: string): Token[] | null {
  const tokens: Token[] = [];
  // numbers (with an optional fraction like 7-1/2 or 7 1/2), unit words, prime marks, a leading minus
  const pattern =
    /\s*(?:(\d+(?:[.,]\d+)?(?:[ -]\d+\/\d+)?|\d+\/\d+)|(feet|foot|ft|inches|inch|in|metres|meters|metre|meter|mm|cm|m)\.?(?![a-z])|(['"])|(-))/y;
  let index = 0;
  while (index < text.length) {
    pattern.lastIndex = index;
    const match = pattern.exec(text);
    if (!match) return null;
    index = pattern.lastIndex;
    if (match[1] !== undefined) {
      const value = parseNumberWithFraction(match[1]);
      if (!value) return null;
      tokens.push({ type: 'number', value, text: match[1] });
    } else if (match[2] !== undefined || match[3] !== undefined) {
      const unit = unitWords[(match[2] ?? match[3]) as string];
      if (!unit) return null;
      tokens.push({ type: 'unit', unit });
    } else if (match[4] !== undefined) {
      tokens.push({ type: 'minus' });
    }
    // skip trailing spaces
    while (text[index] === ' ') index += 1;
  }
  return tokens;
}

function parseNumberWithFraction(text: string): Decimal | null {
  const fractionMatch = /^(?:(\d+)[ -])?(\d+)\/(\d+)$/.exec(text);
  if (fractionMatch) {
    const whole = Number(fractionMatch[1] ?? '0');
    const top = Number(fractionMatch[2]);
    const bottom = Number(fractionMatch[3]);
    // inch fractions only: halves, quarters, eighths, sixteenths
    if (![2, 4, 8, 16].includes(bottom) || top >= bottom || top === 0) return null;
    return { numerator: whole * bottom + top, denominator: bottom };
  }
  return parseDecimal(text);
}

/** value × unitsPerWhole, rounded half up to a whole unit (tenths of a millimetre). */
function scale(value: Decimal, unitsPerWhole: number): number {
  return Math.round((value.numerator * unitsPerWhole) / value.denominator);
}

const isWhole = (value: Decimal) => value.numerator % value.denominator === 0;

const fail = (error: string): FootageParseResult => ({ ok: false, error });

/**
 * Read a distance the way the trade writes it: `52' 7"`, `52 ft 7 in`, `52'7`,
 * `52.6 ft`, `52 feet`, plain `52` (feet), `7"`, `16 m`, `1600 cm`, `16027 mm`.
 */
export function parseFootage(input: string): FootageParseResult {
  const text = normalise(typeof input === 'string' ? input : '');
  if (text === '') return fail(`Enter a distance, like ${EXAMPLES}.`);
  const tokens = tokenise(text);
  const shown = input.trim();
  if (!tokens || tokens.length === 0 || tokens.filter((t) => t.type === 'minus').length > 1) {
    return fail(`"${shown}" is not a distance. Write it like ${EXAMPLES}.`);
  }
  if (tokens[0]?.type === 'minus') {
    return fail('A distance cannot be negative: footage counts from the access point.');
  }
  if (tokens.some((t) => t.type === 'minus')) {
    return fail(`"${shown}" is not a distance. Write it like ${EXAMPLES}.`);
  }

  const shape = tokens.map((t) => (t.type === 'number' ? 'n' : t.type === 'unit' ? t.unit : '?')).join(' ');
  const numbers = tokens.flatMap((t) => (t.type === 'number' ? [t.value] : []));
  const first = numbers[0];
  const second = numbers[1];
  let value: number;

  switch (shape) {
    case 'n':
    case 'n ft':
      if (!first) return fail(`"${shown}" is not a distance.`);
      if (tokens[0]?.type === 'number' && tokens[0].text.includes('/')) {
        return fail('Write fractions only for inches, like 52\' 7 1/2".');
      }
      value = scale(first, UNITS_PER_FOOT);
      break;
    case 'n in':
      if (!first) return fail(`"${shown}" is not a distance.`);
      value = scale(first, UNITS_PER_INCH);
      break;
    case 'n ft n':
    case 'n ft n in': {
      if (!first || !second) return fail(`"${shown}" is not a distance.`);
      if (!isWhole(first)) return fail('Use either decimal feet (52.6 ft) or feet and inches (52\' 7"), not both.');
      const inchValue = second.numerator / second.denominator;
      if (inchValue >= 12) {
        const wholeFeet = first.numerator / first.denominator;
        const carried = Math.floor(inchValue / 12);
        const rest = inchValue - carried * 12;
        return fail(
          `Inches must be less than 12 when feet are given: write ${wholeFeet + carried}' ${formatNumber(rest)}" instead of ${wholeFeet}' ${formatNumber(inchValue)}".`,
        );
      }
      value = first.numerator * UNITS_PER_FOOT + scale(second, UNITS_PER_INCH);
      break;
    }
    case 'n m':
      if (!first) return fail(`"${shown}" is not a distance.`);
      value = scale(first, UNITS_PER_METRE);
      break;
    case 'n cm':
      if (!first) return fail(`"${shown}" is not a distance.`);
      value = scale(first, 100);
      break;
    case 'n mm':
      if (!first) return fail(`"${shown}" is not a distance.`);
      value = scale(first, UNITS_PER_MM);
      break;
    default:
      return fail(`"${shown}" is not a distance. Write it like ${EXAMPLES}.`);
  }

  if (value > MAX_FOOTAGE) {
    return fail(`That is longer than any camera run: the limit is ${MAX_FOOTAGE_FEET.toLocaleString('en-US')} ft.`);
  }
  return { ok: true, value };
}

/** Like parseFootage, but throws a FootageError with the same message. */
export function footageFromText(input: string): Footage {
  const result = parseFootage(input);
  if (!result.ok) throw new FootageError(result.error);
  return result.value;
}

function formatNumber(value: number): string {
  return Number.isInteger(value) ? String(value) : String(Math.round(value * 100) / 100);
}

/** Whole inches, rounded half up. */
export function roundToInches(units: Footage): number {
  return Math.floor((units + UNITS_PER_INCH / 2) / UNITS_PER_INCH);
}

/** The trade's way: `52' 7"` (rounded to the nearest inch). */
export function formatFeetInches(units: Footage): string {
  const totalInches = roundToInches(units);
  const ft = Math.floor(totalInches / 12);
  const inch = totalInches - ft * 12;
  return `${ft}' ${inch}"`;
}

/** Decimal feet: `52.6 ft`. */
export function formatDecimalFeet(units: Footage, digits = 1): string {
  const factor = 10 ** digits;
  const value = Math.floor((units * factor) / UNITS_PER_FOOT + 0.5) / factor;
  return `${value.toFixed(digits)} ft`;
}

/** Metric: `16.0 m` (to the nearest tenth of a metre by default). */
export function formatMetres(units: Footage, digits = 1): string {
  const factor = 10 ** digits;
  const value = Math.floor((units * factor) / UNITS_PER_METRE + 0.5) / factor;
  return `${value.toFixed(digits)} m`;
}

/** Footage in the chosen unit system: `52' 7"` or `16.0 m`. */
export function formatFootage(units: Footage, system: UnitSystem = 'imperial'): string {
  return system === 'metric' ? formatMetres(units) : formatFeetInches(units);
}

/** A round figure for plain sentences: "53 feet" / "16 metres" (the caller adds "about"). */
export function footageInWords(units: Footage, system: UnitSystem = 'imperial'): string {
  if (system === 'metric') {
    const m = Math.max(0, Math.round(units / UNITS_PER_METRE));
    return `${m} ${m === 1 ? 'metre' : 'metres'}`;
  }
  const ft = Math.max(0, Math.round(units / UNITS_PER_FOOT));
  return `${ft} ${ft === 1 ? 'foot' : 'feet'}`;
}
