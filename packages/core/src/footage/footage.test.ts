import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  MAX_FOOTAGE,
  UNITS_PER_FOOT,
  UNITS_PER_INCH,
  UNITS_PER_METRE,
  feet,
  footageFromText,
  footageInWords,
  formatDecimalFeet,
  formatFeetInches,
  formatFootage,
  formatMetres,
  parseFootage,
  roundToInches,
  FootageError,
} from './footage.ts';

const parsed = (text: string) => {
  const result = parseFootage(text);
  if (!result.ok) throw new Error(`expected "${text}" to parse: ${result.error}`);
  return result.value;
};
const errorOf = (text: string) => {
  const result = parseFootage(text);
  if (result.ok) throw new Error(`expected "${text}" to fail, got ${result.value}`);
  return result.error;
};

describe('unit constants (NIST SP 811; NOAA NGS)', () => {
  it('1 in = 25.4 mm exactly and 1 ft = 0.3048 m exactly: both are whole numbers of the stored unit', () => {
    // NIST SP 811: 1 in = 25.4 mm, 1 ft = 0.3048 m (international foot, 1959)
    expect(UNITS_PER_INCH).toBe(254); // 25.4 mm × 10
    expect(UNITS_PER_FOOT).toBe(3048); // 0.3048 m × 10 000
    expect(UNITS_PER_FOOT).toBe(12 * UNITS_PER_INCH);
    expect(UNITS_PER_METRE).toBe(10_000);
  });

  it('does not use the US survey foot (1200/3937 m, retired after 2022 — NOAA NGS)', () => {
    const surveyFootInUnits = (1200 / 3937) * UNITS_PER_METRE;
    expect(UNITS_PER_FOOT).not.toBeCloseTo(surveyFootInUnits, 3);
    // 100 ft by the survey foot would be 0.6 mm longer; we store the international 30.48 m exactly
    expect(feet(100)).toBe(30.48 * UNITS_PER_METRE);
  });
});

describe('parseFootage: the ways the trade writes distance', () => {
  const cases: Array<[string, number]> = [
    [`52' 7"`, 52 * 3048 + 7 * 254],
    ['52 ft 7 in', 52 * 3048 + 7 * 254],
    [`52'7`, 52 * 3048 + 7 * 254],
    [`52'7"`, 52 * 3048 + 7 * 254],
    ['52ft7in', 52 * 3048 + 7 * 254],
    ['52 ft. 7 in.', 52 * 3048 + 7 * 254],
    ['52 feet 7 inches', 52 * 3048 + 7 * 254],
    ['52′ 7″', 52 * 3048 + 7 * 254],
    ['52’ 7”', 52 * 3048 + 7 * 254],
    [`52' 7 1/2"`, 52 * 3048 + 7 * 254 + 127],
    [`52' 7-1/2"`, 52 * 3048 + 7 * 254 + 127],
    ['52.6 ft', Math.round(52.6 * 3048)], // 160 324.8 → 160 325
    ['52.6', Math.round(52.6 * 3048)],
    ['52 feet', 52 * 3048],
    ['52 foot', 52 * 3048],
    ['52', 52 * 3048],
    [`52'`, 52 * 3048],
    [`7"`, 7 * 254],
    ['7 in', 7 * 254],
    ['16 m', 160_000],
    ['16.0 m', 160_000],
    ['16,5 m', 165_000],
    ['16 metres', 160_000],
    ['1600 cm', 160_000],
    ['16027 mm', 160_270],
    ['1,000 ft', 1000 * 3048],
    ['0', 0],
    ['  52 FT  ', 52 * 3048],
  ];
  for (const [text, expected] of cases) {
    it(`reads ${JSON.stringify(text)}`, () => {
      expect(parsed(text)).toBe(expected);
    });
  }

  it("treats 52' 7\" and 52 ft 7 in and 52'7 as the same distance", () => {
    expect(new Set([parsed(`52' 7"`), parsed('52 ft 7 in'), parsed(`52'7`)]).size).toBe(1);
  });

  it('16 m is 52 ft 5.92 in (NIST SP 811: 16 / 0.3048 = 52.493 ft)', () => {
    expect(parsed('16 m') / UNITS_PER_FOOT).toBeCloseTo(16 / 0.3048, 9);
    expect(formatFeetInches(parsed('16 m'))).toBe(`52' 6"`);
  });
});

describe('parseFootage: clear errors for nonsense', () => {
  it('rejects a negative distance', () => {
    expect(errorOf('-3 ft')).toMatch(/cannot be negative/);
    expect(errorOf('−3 ft')).toMatch(/cannot be negative/);
  });
  it('rejects 12 inches or more next to feet, and says how to write it', () => {
    expect(errorOf(`5' 14"`)).toBe(`Inches must be less than 12 when feet are given: write 6' 2" instead of 5' 14".`);
    expect(errorOf('5 ft 12 in')).toMatch(/less than 12/);
  });
  it('asks for a distance when empty', () => {
    expect(errorOf('')).toMatch(/^Enter a distance/);
    expect(errorOf('   ')).toMatch(/^Enter a distance/);
  });
  it('rejects words and junk with an example of what works', () => {
    for (const text of ['abc', '52 yards', '52 7', 'ft', '52..6', '5 ft 3 ft', '3 m 2 ft', '52-', '1/2 ft']) {
      expect(errorOf(text), text).toMatch(/not a distance|fractions only|negative/);
    }
    expect(errorOf('abc')).toContain(`52' 7"`);
  });
  it('rejects decimal feet mixed with inches', () => {
    expect(errorOf(`52.5' 3"`)).toMatch(/either decimal feet/);
  });
  it('rejects distances past any camera run', () => {
    expect(errorOf('2001 ft')).toMatch(/limit is 2,000 ft/);
    expect(parsed('2000 ft')).toBe(MAX_FOOTAGE);
  });
  it('footageFromText throws a FootageError with the same message', () => {
    expect(() => footageFromText('abc')).toThrow(FootageError);
    expect(footageFromText(`10' 0"`)).toBe(feet(10));
  });
});

describe('formatting', () => {
  it('formats the trade way and in metres', () => {
    expect(formatFeetInches(52 * 3048 + 7 * 254)).toBe(`52' 7"`);
    expect(formatFeetInches(0)).toBe(`0' 0"`);
    expect(formatFeetInches(11 * 254 + 200)).toBe(`1' 0"`); // 11.79 in rounds to 12 in
    expect(formatMetres(160_000)).toBe('16.0 m');
    expect(formatMetres(160_274)).toBe('16.0 m');
    expect(formatDecimalFeet(Math.round(52.6 * 3048))).toBe('52.6 ft');
    expect(formatFootage(160_000, 'metric')).toBe('16.0 m');
    expect(formatFootage(feet(10))).toBe(`10' 0"`);
    expect(footageInWords(feet(52.6))).toBe('53 feet');
    expect(footageInWords(feet(1))).toBe('1 foot');
    expect(footageInWords(160_000, 'metric')).toBe('16 metres');
  });
});

describe('round trips (fast-check)', () => {
  it('every whole-inch distance survives format → parse exactly (inches are exact in the stored unit)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 2000 * 12 }), (totalInches) => {
        const units = totalInches * UNITS_PER_INCH;
        expect(parsed(formatFeetInches(units))).toBe(units);
      }),
    );
  });

  it('every whole-millimetre distance survives metres → parse exactly at 0.001 m', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 600_000 }), (mm) => {
        const units = mm * 10;
        expect(parsed(formatMetres(units, 3))).toBe(units);
      }),
    );
  });

  it('any stored distance formats to within half an inch, and formatting is stable after one round trip', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: MAX_FOOTAGE - UNITS_PER_INCH }), (units) => {
        const text = formatFeetInches(units);
        const back = parsed(text);
        expect(Math.abs(back - units)).toBeLessThanOrEqual(UNITS_PER_INCH / 2);
        expect(formatFeetInches(back)).toBe(text);
        expect(roundToInches(back)).toBe(roundToInches(units));
      }),
    );
  });

  it('feet and inches written any of the trade ways parse to the same value', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 1999 }), fc.integer({ min: 0, max: 11 }), (ft, inch) => {
        const expected = ft * UNITS_PER_FOOT + inch * UNITS_PER_INCH;
        for (const text of [`${ft}' ${inch}"`, `${ft} ft ${inch} in`, `${ft}'${inch}`, `${ft} feet ${inch} inches`, `${ft}′${inch}″`]) {
          expect(parsed(text)).toBe(expected);
        }
      }),
    );
  });

  it('decimal feet parse to the nearest tenth of a millimetre', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 19_999 }), (tenths) => {
        const text = `${Math.floor(tenths / 10)}.${tenths % 10} ft`;
        expect(parsed(text)).toBe(Math.round((tenths * UNITS_PER_FOOT) / 10));
        expect(formatDecimalFeet(parsed(text))).toBe(text);
      }),
    );
  });
});
