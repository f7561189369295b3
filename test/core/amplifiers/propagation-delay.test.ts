import { describe, expect, it } from 'vitest';
import { delayForRampS, delayForStepS, delayLawFromPoints } from '../../../src/core/amplifiers/propagation-delay.ts';
import { figuresAtTemperature, NO_DRIFT } from '../../../src/core/amplifiers/temperature-drift.ts';
import { IDEAL_FIGURES } from '../../../src/core/amplifiers/model.ts';
import { CoreError } from '../../../src/core/errors.ts';

describe('comparator delay versus overdrive: t = t∞ + k/Vod (charge-control model of the input stage)', () => {
  // Class-typical points (from memory): 5 mV overdrive 1.2 µs, 100 mV overdrive 0.3 µs.
  const law = delayLawFromPoints({ overdriveV: 5e-3, delayS: 1.2e-6 }, { overdriveV: 0.1, delayS: 0.3e-6 });
  it('passes through both points', () => {
    expect(delayForStepS(law, 5e-3)).toBeCloseTo(1.2e-6, 18);
    expect(delayForStepS(law, 0.1)).toBeCloseTo(0.3e-6, 18);
  });
  it('k and t∞ solve the two linear equations (hand algebra)', () => {
    const k = (1.2e-6 - 0.3e-6) / (1 / 5e-3 - 1 / 0.1);
    expect(law.chargeVS).toBeCloseTo(k, 18);
    expect(law.floorS).toBeCloseTo(0.3e-6 - k / 0.1, 18);
  });
  it('a ramp of slope S moves the same charge after √(2k/S): ∫ S·t dt = k', () => {
    const S = 1e4; // 10 mV/µs
    const t = delayForRampS(law, S) - law.floorS;
    expect((S * t * t) / 2).toBeCloseTo(law.chargeVS, 15);
    expect(delayForRampS(law, 1e3)).toBeGreaterThan(delayForRampS(law, 1e5));
  });
  it('refuses a delay that grows with overdrive and equal overdrives', () => {
    expect(() => delayLawFromPoints({ overdriveV: 5e-3, delayS: 1e-7 }, { overdriveV: 0.1, delayS: 1e-6 })).toThrow(CoreError);
    expect(() => delayLawFromPoints({ overdriveV: 5e-3, delayS: 1e-6 }, { overdriveV: 5e-3, delayS: 1e-7 })).toThrow(CoreError);
  });
});

describe('amplifier figures versus temperature', () => {
  const amp = { ...IDEAL_FIGURES, inputBiasCurrentA: 10e-12, inputOffsetV: 1e-3, outputHeadroomHighV: 0.1, recoveryDelayS: 1e-6 };
  it('JFET/CMOS bias current doubles every 10 K (common practice): ×2^(60/10) at 85 °C', () => {
    const hot = figuresAtTemperature(amp, { ...NO_DRIFT, inputBiasDoublingK: 10 }, 85);
    expect(hot.inputBiasCurrentA).toBeCloseTo(10e-12 * 64, 20);
  });
  it('offset and headroom drift linearly; no drift leaves the figures alone', () => {
    const cold = figuresAtTemperature(amp, { ...NO_DRIFT, inputOffsetDriftVPerK: 5e-6, outputHeadroomDriftVPerK: -1e-3 }, -40, -1);
    expect(cold.inputOffsetV).toBeCloseTo(1e-3 + 5e-6 * 65, 15);
    expect(cold.outputHeadroomHighV).toBeCloseTo(0.1 + 65e-3, 15);
    expect(figuresAtTemperature(amp, NO_DRIFT, 85)).toEqual({ ...amp, inputOffsetV: 1e-3 });
  });
});
