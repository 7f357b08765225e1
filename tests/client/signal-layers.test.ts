import { describe, expect, it } from 'vitest';
import { SIGNAL_GRADE_COLOURS, signalAttributes, signalColourExpression, signalFillLayer, signalSource } from '../../src/components/map/signal-layers';
import { getSignalClasses, SIGNAL_METRICS, SIGNAL_MIN_READINGS } from '../../src/lib/domain/signal-map';
import type { SignalGrade } from '../../src/lib/domain/measurements';

// Colour-vision-deficiency simulation: Machado, Oliveira & Fernandes (2009), "A physiologically-based
// model for simulation of color vision deficiency", IEEE TVCG 15(6), severity 1.0 matrices on linear
// sRGB (from memory, verify); sRGB → linear (IEC 61966-2-1) and CIE L*a*b* under D65 [PUB].
const CVD: Record<string, number[][]> = {
  protanopia: [
    [0.152286, 1.052583, -0.204868],
    [0.114503, 0.786281, 0.099216],
    [-0.003882, -0.048116, 1.051998],
  ],
  deuteranopia: [
    [0.367322, 0.860646, -0.227968],
    [0.280085, 0.672501, 0.047413],
    [-0.01182, 0.04294, 0.968881],
  ],
  tritanopia: [
    [1.255528, -0.076749, -0.178779],
    [-0.078411, 0.930809, 0.147602],
    [0.004733, 0.691367, 0.3039],
  ],
};

const toLinear = (c: number) => {
  const v = c / 255;
  return v <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4;
};

function lab(rgb: number[]): [number, number, number] {
  const [r, g, b] = rgb as [number, number, number];
  const x = 0.4124 * r + 0.3576 * g + 0.1805 * b;
  const y = 0.2126 * r + 0.7152 * g + 0.0722 * b;
  const z = 0.0193 * r + 0.1192 * g + 0.9505 * b;
  const f = (t: number) => (t > 216 / 24389 ? Math.cbrt(t) : ((24389 / 27) * t + 16) / 116);
  const [fx, fy, fz] = [f(x / 0.95047), f(y), f(z / 1.08883)];
  return [116 * fy - 16, 500 * (fx - fy), 200 * (fy - fz)];
}

function seenAs(hex: string, matrix: number[][]): [number, number, number] {
  const rgb = [1, 3, 5].map((k) => toLinear(parseInt(hex.slice(k, k + 2), 16)));
  return lab(matrix.map((row) => Math.min(1, Math.max(0, row[0]! * rgb[0]! + row[1]! * rgb[1]! + row[2]! * rgb[2]!))));
}

const deltaE = (a: number[], b: number[]) => Math.hypot(a[0]! - b[0]!, a[1]! - b[1]!, a[2]! - b[2]!);

describe('the signal ramp', () => {
  const grades = Object.keys(SIGNAL_GRADE_COLOURS) as SignalGrade[];

  it('keeps every two grades apart (CIE76 ΔE ≥ 20) with full colour vision and under simulated protanopia, deuteranopia and tritanopia', () => {
    for (const [name, matrix] of Object.entries({
      ...CVD,
      normal: [
        [1, 0, 0],
        [0, 1, 0],
        [0, 0, 1],
      ],
    })) {
      for (let a = 0; a < grades.length; a++)
        for (let b = a + 1; b < grades.length; b++) {
          const d = deltaE(seenAs(SIGNAL_GRADE_COLOURS[grades[a]!], matrix), seenAs(SIGNAL_GRADE_COLOURS[grades[b]!], matrix));
          expect(d, `${name}: ${grades[a]} vs ${grades[b]}`).toBeGreaterThanOrEqual(20);
        }
    }
  });

  it('is darker at both ends than in the middle, so light and dark tell the grade without hue', () => {
    const lightness = grades.map((g) => seenAs(SIGNAL_GRADE_COLOURS[g], CVD.deuteranopia!)[0]);
    expect(lightness[0]).toBeLessThan(lightness[1]!);
    expect(lightness[1]).toBeLessThan(lightness[2]!);
    expect(lightness[3]).toBeLessThan(lightness[2]!);
    expect(lightness[4]).toBeLessThan(lightness[3]!);
  });
});

describe('signal layer specs', () => {
  it('colour each metric in steps at its grades’ lower bounds, worst first', () => {
    expect(signalColourExpression('rsrp')).toEqual([
      'step',
      ['to-number', ['get', 'rsrp_median_dbm']],
      SIGNAL_GRADE_COLOURS.unusable,
      -110,
      SIGNAL_GRADE_COLOURS.poor,
      -100,
      SIGNAL_GRADE_COLOURS.fair,
      -90,
      SIGNAL_GRADE_COLOURS.good,
      -80,
      SIGNAL_GRADE_COLOURS.excellent,
    ]);
    expect(signalColourExpression('sinr')).toEqual([
      'step',
      ['to-number', ['get', 'sinr_median_db']],
      SIGNAL_GRADE_COLOURS.poor,
      0,
      SIGNAL_GRADE_COLOURS.fair,
      13,
      SIGNAL_GRADE_COLOURS.good,
      20,
      SIGNAL_GRADE_COLOURS.excellent,
    ]);
    for (const metric of SIGNAL_METRICS) expect(getSignalClasses(metric).every((c) => SIGNAL_GRADE_COLOURS[c.grade])).toBe(true);
  });

  it('draw only hexagons with the metric, faint below the reading threshold', () => {
    const layer = signalFillLayer('rsrq');
    expect(layer.filter).toEqual(['has', 'rsrq_median_db']);
    expect(JSON.stringify(layer.paint?.['fill-opacity'])).toContain(`["<",["to-number",["get","rsrq_count"],0],${SIGNAL_MIN_READINGS}]`);
    expect(signalAttributes('rsrp')).toEqual({ median: 'rsrp_median_dbm', count: 'rsrp_count' });
  });

  it('ask the tile endpoint for one operator and band, or all', () => {
    expect(signalSource('http://x', { operatorId: '', band: '' }).tiles).toEqual(['http://x/api/tiles/signal/{z}/{x}/{y}.mvt']);
    expect(signalSource('http://x', { operatorId: '3', band: 'n78' }).tiles).toEqual(['http://x/api/tiles/signal/{z}/{x}/{y}.mvt?operator=3&band=n78']);
  });
});
