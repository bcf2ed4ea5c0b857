/**
 * Exact fractions for money: amounts are kept as BigInt numerator/denominator
 * (in cents) through every multiplication and sum, and rounded once, at the end.
 */
export class Exact {
  readonly numerator: bigint;
  readonly denominator: bigint;

  private constructor(numerator: bigint, denominator: bigint) {
    this.numerator = numerator;
    this.denominator = denominator;
  }

  static readonly zero = new Exact(0n, 1n);

  static of(numerator: number | bigint, denominator: number | bigint = 1): Exact {
    const n = BigInt(numerator);
    const d = BigInt(denominator);
    if (d === 0n) throw new RangeError('Division by zero.');
    return Exact.reduced(n, d);
  }

  /** A finite decimal number given with at most `digits` decimals (e.g. a regional factor 1.15). */
  static fromDecimal(value: number, digits = 4): Exact {
    const scale = 10 ** digits;
    const scaled = Math.round(value * scale);
    return Exact.of(scaled, scale);
  }

  private static reduced(n: bigint, d: bigint): Exact {
    if (d < 0n) {
      n = -n;
      d = -d;
    }
    const g = gcd(n < 0n ? -n : n, d);
    return g > 1n ? new Exact(n / g, d / g) : new Exact(n, d);
  }

  add(other: Exact): Exact {
    if (this.denominator === other.denominator) return Exact.reduced(this.numerator + other.numerator, this.denominator);
    return Exact.reduced(this.numerator * other.denominator + other.numerator * this.denominator, this.denominator * other.denominator);
  }

  mul(other: Exact): Exact {
    return Exact.reduced(this.numerator * other.numerator, this.denominator * other.denominator);
  }

  compare(other: Exact): -1 | 0 | 1 {
    const left = this.numerator * other.denominator;
    const right = other.numerator * this.denominator;
    return left < right ? -1 : left > right ? 1 : 0;
  }

  /** Largest integer ≤ this. */
  floor(): bigint {
    const q = this.numerator / this.denominator;
    return this.numerator < 0n && q * this.denominator !== this.numerator ? q - 1n : q;
  }

  /** Smallest integer ≥ this. */
  ceil(): bigint {
    return -Exact.reduced(-this.numerator, this.denominator).floor();
  }

  /** Nearest integer, halves rounded up. */
  round(): bigint {
    return this.add(Exact.of(1, 2)).floor();
  }

  toNumber(): number {
    return Number(this.numerator) / Number(this.denominator);
  }

  toString(): string {
    return this.denominator === 1n ? `${this.numerator}` : `${this.numerator}/${this.denominator}`;
  }

  static sum(values: readonly Exact[]): Exact {
    return values.reduce((total, value) => total.add(value), Exact.zero);
  }
}

function gcd(a: bigint, b: bigint): bigint {
  while (b !== 0n) {
    const t = a % b;
    a = b;
    b = t;
  }
  return a;
}

/** Whole cents to a display string: 480000 → "$4,800"; 12345 → "$123.45". */
export function formatCents(cents: number | bigint, options: { cents?: boolean } = {}): string {
  const value = Number(cents);
  const negative = value < 0;
  const abs = Math.abs(value);
  const dollars = Math.floor(abs / 100);
  const rest = abs % 100;
  const showCents = options.cents ?? rest !== 0;
  const text = dollars.toLocaleString('en-US') + (showCents ? `.${String(Math.round(rest)).padStart(2, '0')}` : '');
  return `${negative ? '-' : ''}$${text}`;
}
