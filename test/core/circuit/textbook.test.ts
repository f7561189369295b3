/**
 * The closed-form analysis against textbook results and independent hand
 * derivations (the derivations are written out here, not taken from the code).
 */
import { describe, expect, it } from 'vitest';
import { analyzeCircuit, findBuiltInAmplifier, IDEAL_FIGURES, type AmplifierModel, type Circuit } from '../../../src/core/index.ts';
import { CoreError } from '../../../src/core/errors.ts';

const ideal = findBuiltInAmplifier('ideal')!;

function amp(overrides: Partial<AmplifierModel>): AmplifierModel {
  return { ...ideal, ...IDEAL_FIGURES, ...overrides, id: 'test', figuresBasis: 'caller-supplied' } as AmplifierModel;
}

function split(rTiming: number, cTiming: number, beta: number, railV = 10, amplifier = ideal): Circuit {
  // β = rGround / (rGround + rFeedback); pick rGround + rFeedback = 100 kΩ.
  return {
    topology: 'two-resistor-feedback',
    supply: { positiveV: railV, negativeV: -railV },
    amplifier,
    parts: { rTiming, cTiming, rGround: beta * 1e5, rFeedback: (1 - beta) * 1e5 },
  };
}

function divider(rTiming: number, cTiming: number, r: { rTop: number; rBottom: number; rFeedback: number }, supplyV: number, amplifier = ideal): Circuit {
  return { topology: 'three-resistor-divider', supply: { positiveV: supplyV, negativeV: 0 }, amplifier, parts: { rTiming, cTiming, ...r } };
}

describe('split-supply astable, ideal amplifier (Sedra & Smith, Microelectronic Circuits, op-amp astable multivibrator)', () => {
  it('T = 2RC·ln((1+β)/(1−β)) over a range of β', () => {
    for (const beta of [0.1, 0.25, 0.5, 0.75, 0.9, 0.99]) {
      const r = analyzeCircuit(split(4700, 22e-9, beta));
      const expected = 2 * 4700 * 22e-9 * Math.log((1 + beta) / (1 - beta));
      expect(r.periodS).toBeCloseTo(expected, 15);
      expect(r.periodS / expected - 1).toBeLessThan(1e-12);
      expect(r.dutyCycle).toBeCloseTo(0.5, 12);
      expect(r.thresholds.upperV).toBeCloseTo(beta * 10, 12);
      expect(r.thresholds.lowerV).toBeCloseTo(-beta * 10, 12);
    }
  });

  it('worked example: 1 kΩ, 0.25 µF, β = 0.5 gives T ≈ 0.549 ms', () => {
    const r = analyzeCircuit(split(1000, 0.25e-6, 0.5));
    expect(r.periodS * 1e3).toBeCloseTo(0.549, 3);
  });

  it('worked example: 1 kΩ, 0.1 µF, β = 0.9 gives T ≈ 589 µs', () => {
    const r = analyzeCircuit(split(1000, 0.1e-6, 0.9));
    expect(r.periodS * 1e6).toBeCloseTo(589, 0);
  });

  it('first edge from an empty capacitor: RC·ln(1/(1−β)) (derived: charge from 0 toward +V up to βV)', () => {
    const r = analyzeCircuit(split(10_000, 1e-8, 0.4));
    expect(r.firstEdgeS).toBeCloseTo(1e-4 * Math.log(1 / 0.6), 15);
    expect(r.powerUp.determinate).toBe(false); // both states are consistent at v = 0 in a split supply
  });

  it('peak output current at the switching instant: (V + βV)/R + V/(rFeedback + rGround) (Ohm and Kirchhoff)', () => {
    const r = analyzeCircuit(split(10_000, 1e-8, 0.5, 12));
    expect(r.currents.outputPeakSourceA).toBeCloseTo((12 + 6) / 10_000 + 12 / 1e5, 12);
    expect(r.currents.outputPeakSinkA).toBeCloseTo(r.currents.outputPeakSourceA, 12);
  });
});

describe('single-supply divider, three equal resistors', () => {
  const equal = { rTop: 100e3, rBottom: 100e3, rFeedback: 100e3 };

  it('thresholds at V+/3 and 2V+/3 and T = 2·ln2·RC (derived by superposition)', () => {
    const r = analyzeCircuit(divider(33e3, 10e-9, equal, 12));
    expect(r.thresholds.lowerV).toBeCloseTo(4, 12);
    expect(r.thresholds.upperV).toBeCloseTo(8, 12);
    expect(r.periodS).toBeCloseTo(2 * Math.LN2 * 33e3 * 10e-9, 15);
    expect(r.dutyCycle).toBeCloseTo(0.5, 12);
  });

  it('common practice: the rounded rule f ≈ 1/(1.4·R·C) agrees within 2 %', () => {
    const R = 47e3;
    const C = 2.2e-9;
    const r = analyzeCircuit(divider(R, C, equal, 5));
    expect(Math.abs(r.frequencyHz * 1.4 * R * C - 1)).toBeLessThan(0.02);
  });

  it('equal headroom to both rails leaves the period unchanged (derived: both dwell ratios stay 2)', () => {
    const base = analyzeCircuit(divider(10e3, 100e-9, equal, 12));
    const withHeadroom = analyzeCircuit(divider(10e3, 100e-9, equal, 12, amp({ outputHeadroomHighV: 1.3, outputHeadroomLowV: 1.3 })));
    expect(withHeadroom.periodS / base.periodS - 1).toBeLessThan(1e-12);
    expect(withHeadroom.output.highV).toBeCloseTo(12 - 1.3, 12);
    expect(withHeadroom.output.lowV).toBeCloseTo(1.3, 12);
  });

  it('unequal headroom moves the duty cycle as the exponentials say', () => {
    // Output high at Vh = 12 − 1.5, low at Vl = 0. Millman at P: p = (V+ + Vout)/3 with equal resistors.
    const V = 12;
    const Vh = V - 1.5;
    const Vl = 0;
    const upper = (V + Vh) / 3;
    const lower = (V + Vl) / 3;
    const RC = 10e3 * 100e-9;
    const tHigh = RC * Math.log((Vh - lower) / (Vh - upper));
    const tLow = RC * Math.log((upper - Vl) / (lower - Vl));
    const r = analyzeCircuit(divider(10e3, 100e-9, equal, V, amp({ outputHeadroomHighV: 1.5 })));
    expect(r.timeHighS).toBeCloseTo(tHigh, 15);
    expect(r.timeLowS).toBeCloseTo(tLow, 15);
    // Headroom lowers the high level AND the upper threshold: the discharge from 7.5 V to 4 V is quicker
    // (ln 1.875) than the charge toward 10.5 V (ln 2.17), so the duty rises above one half.
    expect(r.dutyCycle).toBeGreaterThan(0.5);
    expect(r.dutyCycle).toBeCloseTo(tHigh / (tHigh + tLow), 12);
  });

  it('arbitrary divider: thresholds by Millman’s theorem, dwell times by the exponential law', () => {
    const parts = { rTop: 56e3, rBottom: 82e3, rFeedback: 150e3 };
    const V = 9;
    const millman = (vOut: number) =>
      (V / parts.rTop + 0 / parts.rBottom + vOut / parts.rFeedback) / (1 / parts.rTop + 1 / parts.rBottom + 1 / parts.rFeedback);
    const upper = millman(V);
    const lower = millman(0);
    const RC = 27e3 * 3.3e-9;
    const r = analyzeCircuit(divider(27e3, 3.3e-9, parts, V));
    expect(r.thresholds.upperV).toBeCloseTo(upper, 12);
    expect(r.thresholds.lowerV).toBeCloseTo(lower, 12);
    expect(r.timeHighS).toBeCloseTo(RC * Math.log((V - lower) / (V - upper)), 15);
    expect(r.timeLowS).toBeCloseTo(RC * Math.log(upper / lower), 15);
    expect(r.powerUp).toEqual({ initialState: 'high', determinate: true });
    expect(r.firstEdgeS).toBeCloseTo(RC * Math.log(V / (V - upper)), 15);
  });

  it('output resistance: the pin sags by the current it delivers (checked against a hand-solved two-node network)', () => {
    // Split supply so the network is small: source Vs behind Ro drives rTiming to C and the rFeedback/rGround divider.
    const Ro = 200;
    const parts = { rTiming: 2e3, cTiming: 1e-7, rFeedback: 10e3, rGround: 10e3 };
    const Vs = 10;
    const r = analyzeCircuit({ topology: 'two-resistor-feedback', supply: { positiveV: Vs, negativeV: -Vs }, amplifier: amp({ outputResistanceOhm: Ro }), parts });
    // Thevenin seen by the capacitor: Ro in series? No — the pin loads Ro with (rFeedback + rGround) as well.
    // Pin node: (Vs − Vpin)/Ro = (Vpin − v)/rTiming + Vpin/(rFeedback + rGround). Solve for Vpin(v), then
    // iCap = (Vpin − v)/rTiming = a − v/Rth. Here by hand with numbers:
    const gO = 1 / Ro;
    const gT = 1 / parts.rTiming;
    const gD = 1 / (parts.rFeedback + parts.rGround);
    const pin = (v: number, vs: number) => (vs * gO + v * gT) / (gO + gT + gD);
    const iCap = (v: number, vs: number) => (pin(v, vs) - v) * gT;
    const G = iCap(0, Vs) - iCap(1, Vs); // conductance seen by C
    const vInfHigh = iCap(0, Vs) / G;
    const beta = 0.5;
    const upper = beta * pin(upperGuess(), Vs);
    function upperGuess() {
      // p = β·Vpin(v) and the switch happens at v = p: v = β·(Vs·gO + v·gT)/(gO+gT+gD) -> solve linearly.
      const k = beta / (gO + gT + gD);
      return (k * Vs * gO) / (1 - k * gT);
    }
    expect(r.thresholds.upperV).toBeCloseTo(upper, 12);
    expect(r.states.high.asymptoteV).toBeCloseTo(vInfHigh, 12);
    expect(r.states.high.tauS).toBeCloseTo(parts.cTiming / G, 15);
  });
});

describe('circuits that cannot oscillate', () => {
  it('a threshold beyond what the output can reach latches, naming the stuck state', () => {
    const c = divider(10e3, 1e-8, { rTop: 1e3, rBottom: 100e3, rFeedback: 100e3 }, 12, amp({ outputHeadroomHighV: 2 }));
    try {
      analyzeCircuit(c);
      expect.unreachable('should have thrown');
    } catch (e) {
      expect(e).toBeInstanceOf(CoreError);
      expect((e as CoreError).code).toBe('no-oscillation');
      expect((e as CoreError).message).toMatch(/latches high/);
      expect((e as CoreError).details?.stuckState).toBe('high');
    }
  });
});

describe('checks', () => {
  it('flags the SELV caution above 60 V DC and defers to local codes', () => {
    const r = analyzeCircuit(split(100e3, 1e-9, 0.5, 40, amp({})));
    const selv = r.checks.find((c) => c.code === 'selv-exceeded');
    expect(selv?.severity).toBe('caution');
    expect(selv?.message).toMatch(/local electrical codes/);
  });

  it('flags an output current beyond the limit (trade rule: the output must not be asked for more than it can give)', () => {
    const r = analyzeCircuit(split(500, 1e-8, 0.5, 12, amp({ outputCurrentLimitA: 0.02 })));
    const c = r.checks.find((x) => x.code === 'output-current-over-limit');
    expect(c).toBeDefined();
    expect(c!.peakCurrentA).toBeGreaterThan(0.02);
  });

  it('flags supply out of the amplifier range, common-mode excursions and clamp conduction', () => {
    const r = analyzeCircuit(
      split(10e3, 1e-8, 0.8, 12, amp({ supplyMaxV: 18, inputCommonModeLowMarginV: 3, inputCommonModeHighMarginV: 3, differentialClampV: 0.7 })),
    );
    const codes = r.checks.map((c) => c.code);
    expect(codes).toContain('supply-out-of-range');
    expect(codes).toContain('common-mode-exceeded');
    expect(codes).toContain('input-clamp-conducts');
  });

  it('bias current through megohm resistors shifts the thresholds (I·R against the hysteresis)', () => {
    const lowBias = analyzeCircuit(split(1e6, 1e-9, 0.1, 5, amp({ inputBiasCurrentA: 1e-12 })));
    const highBias = analyzeCircuit(split(1e6, 1e-9, 0.1, 5, amp({ inputBiasCurrentA: 500e-9 })));
    expect(lowBias.checks.map((c) => c.code)).not.toContain('bias-shifts-thresholds');
    expect(highBias.checks.map((c) => c.code)).toContain('bias-shifts-thresholds');
    // rGround ∥ rFeedback = 10 kΩ ∥ 90 kΩ = 9 kΩ; shift = 500 nA · 9 kΩ = 4.5 mV.
    expect(highBias.biasThresholdShiftV).toBeCloseTo(500e-9 * 9e3, 12);
  });
});
