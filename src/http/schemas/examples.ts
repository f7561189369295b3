/**
 * Examples in the contract: a request example for every POST and PUT and a
 * response example for every 200, from the README's scenarios of our own.
 * Request examples are written here; response examples are what the service
 * answered to them (`npm run examples:write` runs them through the app and
 * writes examples.generated.ts) — never written by hand. They are merged into
 * the OpenAPI document by the swagger plugin's transformObject, so the schema
 * files carry no example data.
 */
import { RESPONSE_EXAMPLES } from './examples.generated.ts';

export interface NamedExample {
  summary: string;
  value: unknown;
}

/** 'METHOD /openapi/path' -> example name -> example. */
export type ExampleTable = Record<string, Record<string, NamedExample>>;

// A greenhouse soil-moisture probe's 5 kHz excitation clock on a 5 V rail (README).
const PROBE_CLOCK = {
  topology: 'three-resistor-divider',
  supply: { positiveV: 5 },
  amplifier: 'cmos-rrio-fast',
  parts: { rTiming: '15k', cTiming: '10n', rTop: '100k', rBottom: '100k', rFeedback: '100k' },
};
// The designed probe clock (README: design, then tolerance and waveform).
const DESIGNED_PROBE_CLOCK = {
  topology: 'three-resistor-divider',
  supply: { positiveV: 5 },
  amplifier: 'cmos-rrio-fast',
  parts: { rTiming: '2k2', cTiming: '180n', rTop: '5k1', rBottom: '5k1', rFeedback: '18k' },
};
// A ±2.5 V bridge-excitation clock that runs slow on the bench (README: fit).
const BRIDGE_CLOCK = {
  topology: 'two-resistor-feedback',
  supply: { positiveV: 2.5, negativeV: -2.5 },
  amplifier: 'cmos-rrio-fast',
  parts: { rTiming: '16k', cTiming: '4n7', rFeedback: '22k', rGround: '10k' },
};
const PROBE_ROLES = { rTiming: 'R1', cTiming: 'C1', rTop: 'R2', rBottom: 'R3', rFeedback: 'R4' };

export const CATALOGUE_EXAMPLE_ID = 'greenhouse-approved';
export const AMPLIFIER_EXAMPLE_ID = 'greenhouse-probe-amp';

export const REQUEST_EXAMPLES: ExampleTable = {
  'POST /v1/analyze': {
    probeClock: { summary: 'The soil-moisture probe clock as drawn: 5 V, 15 kΩ / 10 nF, equal 100 kΩ divider', value: PROBE_CLOCK },
  },
  'POST /v1/design': {
    fiveKilohertz: {
      summary: '5 kHz at 50 % duty within 1 % from a 5 V rail, two designs',
      value: { targetFrequencyHz: 5000, targetDutyCycle: 0.5, frequencyTolerance: 0.01, supply: { positiveV: 5 }, amplifier: 'cmos-rrio-fast', count: 2 },
    },
  },
  'POST /v1/snap': {
    oneValue: {
      summary: 'Round an ideal 15.8 kΩ to E24',
      value: { values: [{ ideal: 15800, kind: 'resistor', source: { series: 'E24' } }] },
    },
  },
  'POST /v1/tolerance': {
    probeClockProof: {
      summary: 'Worst case and Monte Carlo of the designed probe clock against 5 kHz ±5 %',
      value: {
        circuit: DESIGNED_PROBE_CLOCK,
        tolerances: { rTiming: 0.01, cTiming: 0.05, rTop: 0.01, rBottom: 0.01, rFeedback: 0.01 },
        temperature: { minC: -20, maxC: 60 },
        temperatureCoefficients: { cTiming: { dielectric: 'C0G' } },
        supplyTolerance: 0.05,
        monteCarlo: { samples: 20000, seed: 7, distribution: 'normal' },
        spec: { frequencyHz: 5000, frequencyTolerance: 0.05 },
      },
    },
  },
  'POST /v1/waveform': {
    probeClockTraces: { summary: 'Two periods of the designed probe clock, 40 samples (JSON)', value: { circuit: DESIGNED_PROBE_CLOCK, periods: 2, samples: 40 } },
  },
  'POST /v1/fit': {
    slowBridgeClock: {
      summary: 'Scope figures of a bridge clock designed for 10.09 kHz that runs at 9.31 kHz',
      value: {
        circuit: BRIDGE_CLOCK,
        tolerances: { cTiming: 0.1, rTiming: 0.01, rFeedback: 0.01, rGround: 0.01 },
        measurements: {
          frequencyHz: { value: 9310, uncertainty: 5 },
          dutyCycle: { value: 0.5, uncertainty: 0.002 },
          capacitorMaxV: { value: 0.79, uncertainty: 0.01 },
          capacitorMinV: { value: -0.79, uncertainty: 0.01 },
          capacitorRisingTauS: { value: 81.3e-6, uncertainty: 0.8e-6 },
        },
      },
    },
  },
  'POST /v1/bom-checks': {
    probeClockRevisions: {
      summary: 'Two revisions of the probe clock; revision D swapped the capacitor for a Y5V part',
      value: {
        assemblies: [
          {
            id: 'probe-clock-rev-c',
            lines: [
              { refdes: 'R1', value: '22K 1% 0603' },
              { refdes: 'C1', value: '4n7 50V C0G 2%' },
              { refdes: 'R2, R3, R4', value: '68K 1% 0603' },
            ],
            roles: PROBE_ROLES,
            topology: 'three-resistor-divider',
            amplifier: 'cmos-rrio-fast',
            supply: { positiveV: 5, tolerance: 0.05 },
            temperature: { minC: 0, maxC: 50 },
            spec: { frequencyHz: 7000, frequencyTolerance: 0.1, dutyMin: 0.4, dutyMax: 0.6, minimumYield: 0.99 },
            series: 'E24',
          },
          {
            id: 'probe-clock-rev-d',
            lines: [
              { refdes: 'R1', value: '22K 5% 0603' },
              { refdes: 'C1', value: '4n7/16V Y5V' },
              { refdes: 'R2, R3, R4', value: '68K 1% 0603' },
            ],
            roles: PROBE_ROLES,
            topology: 'three-resistor-divider',
            amplifier: 'cmos-rrio-fast',
            supply: { positiveV: 5, tolerance: 0.05 },
            temperature: { minC: 0, maxC: 50 },
            spec: { frequencyHz: 7000, frequencyTolerance: 0.1, minimumYield: 0.99 },
            series: 'E24',
          },
        ],
      },
    },
  },
  'PUT /v1/catalogues/{id}': {
    greenhouseApproved: {
      summary: `The greenhouse line's approved timing capacitors (PUT /v1/catalogues/${CATALOGUE_EXAMPLE_ID})`,
      value: {
        name: 'Greenhouse line approved timing parts',
        parts: [
          { kind: 'capacitor', value: '10n', tolerance: 0.05, dielectric: 'C0G', ratedVoltageV: 50, partNumber: 'GH-C-0101', package: '0603', status: 'preferred' },
          { kind: 'capacitor', value: '47n', tolerance: 0.05, dielectric: 'C0G', ratedVoltageV: 25, partNumber: 'GH-C-0103', package: '1206', status: 'active' },
          { kind: 'capacitor', value: '100n', tolerance: 0.1, dielectric: 'X7R', ratedVoltageV: 25, partNumber: 'GH-C-0104', package: '0603', status: 'not-for-new-designs' },
        ],
      },
    },
  },
  'PUT /v1/amplifiers/{id}': {
    measuredProbeAmp: {
      summary: `The probe's op-amp with bench-measured slew rate and delay, based on an archetype (PUT /v1/amplifiers/${AMPLIFIER_EXAMPLE_ID})`,
      value: {
        name: 'Greenhouse probe op-amp, bench figures',
        description: 'Slew rate and recovery delay measured on three boards; the rest from the archetype',
        base: 'cmos-rrio-fast',
        slewRateVPerS: 8e6,
        recoveryDelayS: 2.5e-7,
      },
    },
  },
};

type Doc = {
  paths?: Record<string, Record<string, { requestBody?: { content?: Record<string, Record<string, unknown>> }; responses?: Record<string, { content?: Record<string, Record<string, unknown>> }> }>>;
};

/** Adds the examples to a generated OpenAPI document (the swagger plugin's transformObject). */
export function withExamples<T>(document: T, requests: ExampleTable = REQUEST_EXAMPLES, responses: ExampleTable = RESPONSE_EXAMPLES): T {
  const doc = document as Doc;
  for (const [path, operations] of Object.entries(doc.paths ?? {})) {
    for (const [method, operation] of Object.entries(operations)) {
      const key = `${method.toUpperCase()} ${path}`;
      const json = operation.requestBody?.content?.['application/json'];
      if (json && requests[key]) json.examples = requests[key];
      const ok = operation.responses?.['200']?.content;
      const answered = responses[key];
      if (ok && answered) {
        const mediaType = ok['application/json'] ? 'application/json' : Object.keys(ok)[0];
        ok[mediaType].examples = answered;
      }
    }
  }
  return document;
}
