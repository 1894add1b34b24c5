import { describe, it, expect } from 'vitest';
import {
	KG_PER_LB,
	M2_PER_FT2,
	M3H_PER_CFM,
	MM_PER_IN,
	formatAirFlow,
	formatArea,
	formatDimensions,
	formatOpening,
	formatInput,
	formatInputNumber,
	formatLength,
	formatMass,
	formatMassRange,
	formatNumber,
	inToMm,
	kgToLb,
	lbToKg,
	mmToIn,
	parseAirFlow,
	parseArea,
	parseLength,
	parseMass,
	type ParseResult
} from './units';

function value(r: ParseResult): number {
	if (!r.ok) throw new Error(`expected ok, got: ${r.message}`);
	return r.value;
}
function message(r: ParseResult): string {
	if (r.ok) throw new Error(`expected a refusal, got ${r.value}`);
	return r.message;
}

describe('exact factors', () => {
	it('1 in = 25.4 mm exactly', () => {
		// 1 in = 25.4 mm exactly, international yard and pound agreement (1959); NIST SP 811 App. B
		expect(MM_PER_IN).toBe(25.4);
		expect(inToMm(1)).toBe(25.4);
		// 43.3 in × 25.4 = 1 099.82 mm, by hand
		expect(inToMm(43.3)).toBeCloseTo(1099.82, 9);
		expect(mmToIn(254)).toBe(10);
	});

	it('1 lb = 0.45359237 kg exactly', () => {
		// 1 lb = 0.45359237 kg exactly, same agreement; NIST SP 811 App. B
		expect(KG_PER_LB).toBe(0.45359237);
		// 2 900 lb × 0.45359237 = 1 315.417873 kg, by hand
		expect(lbToKg(2900)).toBeCloseTo(1315.417873, 9);
		expect(kgToLb(0.45359237)).toBe(1);
	});

	it('1 cfm = 1.6990108 m³/h and 1 ft² = 0.09290304 m²', () => {
		// 0.3048³ m³ × 60 /h = 1.69901079552 m³/h, derived exactly from 1 ft = 0.3048 m (REFERENCES: 1.6990108)
		expect(M3H_PER_CFM).toBeCloseTo(1.69901079552, 12);
		expect(M3H_PER_CFM).toBeCloseTo(1.6990108, 7);
		// 0.3048² = 0.09290304 m² exactly (NIST SP 811 App. B)
		expect(M2_PER_FT2).toBe(0.09290304);
	});
});

describe('parseLength', () => {
	it('reads inches, millimetres, metres and centimetres', () => {
		// 1 in = 25.4 mm exactly, NIST SP 811 App. B: 43.3 in = 1 099.82 mm
		expect(value(parseLength('43.3 in'))).toBeCloseTo(1099.82, 9);
		expect(value(parseLength('43.3in'))).toBeCloseTo(1099.82, 9);
		expect(value(parseLength('43.3"'))).toBeCloseTo(1099.82, 9);
		expect(value(parseLength('43.3 inches'))).toBeCloseTo(1099.82, 9);
		expect(value(parseLength('1100 mm'))).toBe(1100);
		expect(value(parseLength('1100mm'))).toBe(1100);
		// 1 m = 1 000 mm, 1 cm = 10 mm (SI)
		expect(value(parseLength('1.1 m'))).toBeCloseTo(1100, 9);
		expect(value(parseLength('110 cm'))).toBe(1100);
		expect(value(parseLength('.5 m'))).toBe(500);
	});

	it('reads feet and inches in both notations', () => {
		// 3 ft 7 in = 43 in = 1 092.2 mm (12 in a foot, 25.4 mm an inch), by hand
		expect(value(parseLength('3 ft 7 in'))).toBeCloseTo(1092.2, 9);
		expect(value(parseLength(`3' 7"`))).toBeCloseTo(1092.2, 9);
		expect(value(parseLength(`3'7"`))).toBeCloseTo(1092.2, 9);
		expect(value(parseLength('3ft7'))).toBeCloseTo(1092.2, 9);
		expect(value(parseLength('3\u2032 7\u2033'))).toBeCloseTo(1092.2, 9);
		// 4 ft = 48 in = 1 219.2 mm
		expect(value(parseLength('4 ft'))).toBeCloseTo(1219.2, 9);
		expect(value(parseLength(`4'`))).toBeCloseTo(1219.2, 9);
		// 3 ft 7 1/2 in = 43.5 in = 1 104.9 mm
		expect(value(parseLength(`3' 7 1/2"`))).toBeCloseTo(1104.9, 9);
	});

	it('reads inch fractions', () => {
		// 35 1/2 in = 35.5 in = 901.7 mm, by hand
		expect(value(parseLength('35 1/2 in'))).toBeCloseTo(901.7, 9);
		expect(value(parseLength('1/2"'))).toBeCloseTo(12.7, 9);
	});

	it("a bare number takes the user's system's unit", () => {
		expect(value(parseLength('1100'))).toBe(1100);
		expect(value(parseLength('1100', 'metric'))).toBe(1100);
		// 1 in = 25.4 mm: 43.3 → 1 099.82 mm for an imperial user
		expect(value(parseLength('43.3', 'imperial'))).toBeCloseTo(1099.82, 9);
	});

	it('accepts the grouped numbers Traywise itself displays', () => {
		expect(value(parseLength('1 100 mm'))).toBe(1100);
		expect(value(parseLength('1\u00a0100 mm'))).toBe(1100);
		expect(value(parseLength('1,100 mm'))).toBe(1100);
		expect(value(parseLength(formatLength(1100, 'metric', { both: false })))).toBe(1100);
	});

	it('refuses what it cannot read, with a clear message', () => {
		expect(message(parseLength(''))).toMatch(/Enter a length/);
		expect(message(parseLength('abc'))).toMatch(/does not start with a number/);
		expect(message(parseLength('12 furlongs'))).toMatch(/unknown unit “furlongs”/);
		expect(message(parseLength('12 kg'))).toMatch(/unit of mass/);
		expect(message(parseLength('-5 mm'))).toMatch(/cannot be negative/);
		expect(message(parseLength('1.2.3 mm'))).toMatch(/not a number/);
		expect(message(parseLength(`3' 14"`))).toMatch(/under 12/);
	});
});

describe('decimal separators (decision: point for decimals, comma only for thousands)', () => {
	it('reads a comma as a thousands separator', () => {
		// 2 900 lb × 0.45359237 kg/lb = 1 315.417873 kg (NIST SP 811 App. B factor, by hand)
		expect(value(parseMass('2,900 lb'))).toBeCloseTo(1315.417873, 9);
		expect(value(parseMass('12,345.5 kg'))).toBe(12345.5);
	});

	it('refuses a decimal comma such as "1,5" and says to use a point', () => {
		const m = message(parseLength('1,5 m'));
		expect(m).toMatch(/use a point for decimals \(1\.5\)/);
		expect(m).toMatch(/thousands separator/);
		expect(message(parseMass('1,50 kg'))).toMatch(/use a point/);
		expect(message(parseMass('12,5000 kg'))).toMatch(/use a point/);
	});
});

describe('parseMass', () => {
	it('reads kilograms, pounds and tonnes', () => {
		expect(value(parseMass('1315 kg'))).toBe(1315);
		expect(value(parseMass('1315kg'))).toBe(1315);
		// 1 t = 1 000 kg (SI)
		expect(value(parseMass('1.3 t'))).toBe(1300);
		// 1 lb = 0.45359237 kg exactly, NIST SP 811 App. B
		expect(value(parseMass('1 lb'))).toBe(0.45359237);
		expect(value(parseMass('100 lbs'))).toBeCloseTo(45.359237, 9);
		expect(value(parseMass('100', 'imperial'))).toBeCloseTo(45.359237, 9);
		expect(value(parseMass('100', 'metric'))).toBe(100);
		expect(message(parseMass('100 mm'))).toMatch(/unit of length/);
	});
});

describe('parseAirFlow', () => {
	it('reads cfm and m³/h in several spellings', () => {
		// 100 cfm × 1.69901079552 = 169.901079552 m³/h (1 ft = 0.3048 m exactly)
		expect(value(parseAirFlow('100 cfm'))).toBeCloseTo(169.901079552, 9);
		expect(value(parseAirFlow('100', 'imperial'))).toBeCloseTo(169.901079552, 9);
		expect(value(parseAirFlow('170 m3/h'))).toBe(170);
		expect(value(parseAirFlow('170 m³/h'))).toBe(170);
		expect(value(parseAirFlow('170 m³ / h'))).toBe(170);
		expect(value(parseAirFlow('170'))).toBe(170);
		// 1 L/s = 3.6 m³/h (3 600 s an hour ÷ 1 000 L a m³)
		expect(value(parseAirFlow('10 l/s'))).toBeCloseTo(36, 9);
	});
});

describe('parseArea', () => {
	it('reads m² and ft²', () => {
		expect(value(parseArea('40 m²'))).toBe(40);
		expect(value(parseArea('40 m2'))).toBe(40);
		expect(value(parseArea('40 sq m'))).toBe(40);
		// 1 ft² = 0.09290304 m² exactly: 100 ft² = 9.290304 m²
		expect(value(parseArea('100 ft²'))).toBeCloseTo(9.290304, 12);
		expect(value(parseArea('100 sq ft'))).toBeCloseTo(9.290304, 12);
		expect(value(parseArea('100', 'imperial'))).toBeCloseTo(9.290304, 12);
		expect(message(parseArea('40 m'))).toMatch(/unit of length/);
	});
});

describe('formatting shows both systems', () => {
	it('groups digits', () => {
		expect(formatNumber(1100, 0)).toBe('1 100');
		expect(formatNumber(1234567.891, 2, ',')).toBe('1,234,567.89');
		expect(formatNumber(999, 0)).toBe('999');
		expect(formatNumber(-0.01, 1)).toBe('0.0');
	});

	it('formatLength: metric first by default, imperial first for imperial users', () => {
		// 1 100 mm ÷ 25.4 = 43.307… in (NIST SP 811 factor), shown to 0.1 in
		expect(formatLength(1100)).toBe('1 100 mm (43.3 in)');
		expect(formatLength(1100, 'imperial')).toBe('43.3 in (1 100 mm)');
		expect(formatLength(1100, 'imperial', { both: false })).toBe('43.3 in');
	});

	it('formatMass, formatAirFlow, formatArea', () => {
		// 1 315 kg ÷ 0.45359237 = 2 899.1 lb, by hand
		expect(formatMass(1315)).toBe('1 315 kg (2,899 lb)');
		expect(formatMass(1315, 'imperial')).toBe('2,899 lb (1 315 kg)');
		// 170 m³/h ÷ 1.69901079552 = 100.06 cfm
		expect(formatAirFlow(170)).toBe('170 m³/h (100 cfm)');
		expect(formatAirFlow(170, 'imperial')).toBe('100 cfm (170 m³/h)');
		// 40 m² ÷ 0.09290304 = 430.56 ft²
		expect(formatArea(40)).toBe('40.0 m² (431 ft²)');
		expect(formatArea(40, 'imperial')).toBe('431 ft² (40.0 m²)');
		// natural-ventilation opening for 20.46 m³/h: 28 × 20.46 = 572.9 cm² (EN IEC 62485-2/-3 worked
		// example); ÷ 6.4516 cm²/in² (1 in = 2.54 cm exactly) = 88.8 in², by hand
		expect(formatOpening(572.9)).toBe('573 cm² (89 in²)');
		expect(formatOpening(3437.3, 'imperial')).toBe('533 in² (3 437 cm²)');
	});

	it('input values round-trip through the parsers', () => {
		expect(formatInput('length', 1100, 'imperial')).toBe('43.31 in');
		expect(value(parseLength(formatInput('length', 1100, 'metric')))).toBe(1100);
		expect(value(parseMass(formatInput('mass', 1315, 'imperial')))).toBeCloseTo(1315, 0);
		expect(value(parseAirFlow(formatInput('airFlow', 150, 'imperial')))).toBeCloseTo(150, 0);
		expect(value(parseArea(formatInput('area', 40, 'imperial')))).toBeCloseTo(40, 1);
	});

	it('a field with its unit beside it holds only the number, read back in that unit', () => {
		// the measured battery field showed "1099.8 mm" next to an "mm" tag
		expect(formatInputNumber('length', 1099.8, 'metric')).toBe('1099.8');
		expect(formatInputNumber('length', 1100, 'imperial')).toBe('43.31');
		expect(formatInputNumber('mass', 1315.4, 'metric')).toBe('1315.4');
		for (const system of ['metric', 'imperial'] as const) {
			expect(value(parseLength(formatInputNumber('length', 1100, system), system))).toBeCloseTo(1100, 0);
			expect(value(parseMass(formatInputNumber('mass', 1315, system), system))).toBeCloseTo(1315, 0);
			expect(value(parseAirFlow(formatInputNumber('airFlow', 150, system), system))).toBeCloseTo(150, 0);
			expect(value(parseArea(formatInputNumber('area', 40, system), system))).toBeCloseTo(40, 1);
		}
	});

	it('a range shows both ends in both systems, the user’s first', () => {
		// 640 kg ÷ 0.45359237 = 1 410.96 lb; 820 kg → 1 807.79 lb (by hand)
		expect(formatMassRange(640, 820, 'imperial')).toBe('1,411–1,808 lb (640–820 kg)');
		expect(formatMassRange(640, 820)).toBe('640–820 kg (1,411–1,808 lb)');
	});

	it('a battery’s size shows in both systems, the user’s first', () => {
		// 1 000 / 820 / 580 mm ÷ 25.4 = 39.37 / 32.28 / 22.83 in
		expect(formatDimensions([1000, 820, 580])).toBe('1 000 × 820 × 580 mm (39.4 × 32.3 × 22.8 in)');
		expect(formatDimensions([1000, 820, 580], 'imperial')).toBe('39.4 × 32.3 × 22.8 in (1 000 × 820 × 580 mm)');
	});
});
