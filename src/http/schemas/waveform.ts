/** Request and response schemas of POST /v1/waveform. */
import { Type, type Static } from 'typebox';
import { MAX_WAVEFORM_PERIODS, MAX_WAVEFORM_SAMPLES } from '../../core/index.ts';
import { Circuit } from './circuit.ts';
import { ref } from './common.ts';

export const DEFAULT_WAVEFORM_PERIODS = 3;
export const DEFAULT_WAVEFORM_SAMPLES = 2000;

export const WaveformRequest = Type.Object(
  {
    circuit: ref(Circuit, 'The circuit to simulate, as a POST /v1/analyze body'),
    periods: Type.Optional(
      Type.Integer({ minimum: 1, maximum: MAX_WAVEFORM_PERIODS, default: DEFAULT_WAVEFORM_PERIODS, description: 'Periods of the steady oscillation to cover' }),
    ),
    samples: Type.Optional(
      Type.Integer({
        minimum: 2,
        default: DEFAULT_WAVEFORM_SAMPLES,
        description: `Samples on a uniform time grid, both ends included; more than ${MAX_WAVEFORM_SAMPLES} is refused with 422`,
      }),
    ),
    includePowerUp: Type.Optional(
      Type.Boolean({ default: false, description: 'Start at power-up with the capacitor empty instead of at a rising decision of the steady state' }),
    ),
  },
  { $id: 'WaveformRequest', additionalProperties: false, description: 'A circuit and the time window to sample' },
);

export type WaveformRequestBody = Static<typeof WaveformRequest>;

const Series = (description: string) => Type.Array(Type.Number(), { description });

export const Waveform = Type.Object(
  {
    model: Type.Literal('time-domain', { description: 'Waveforms always come from the time-domain engine' }),
    frequencyHz: Type.Number({ description: 'Steady-state frequency of the simulated circuit, Hz (as POST /v1/analyze reports it)' }),
    periodS: Type.Number({ description: 'Steady-state period, s' }),
    dutyCycle: Type.Number({ description: 'Fraction of the period the output is high, between 50 % crossings' }),
    thresholds: Type.Object(
      {
        upperV: Type.Number({ description: 'Capacitor voltage at which a high output switches low, V' }),
        lowerV: Type.Number({ description: 'Capacitor voltage at which a low output switches high, V' }),
      },
      { additionalProperties: false, description: 'Switching thresholds, to draw beside capacitorV' },
    ),
    includePowerUp: Type.Boolean({ description: 'Echo of the request: true when timeS starts at power-up with the capacitor empty' }),
    timeS: Series('Sample times from the window start (power-up, or a rising decision), s'),
    capacitorV: Series('Timing-capacitor voltage (inverting input N), V'),
    outputV: Series('Output pin voltage, V'),
    decisionV: Series('Threshold node (non-inverting input P), V'),
  },
  { $id: 'Waveform', additionalProperties: false, description: 'Sampled node voltages of the simulated circuit; the arrays share one index' },
);

export const WAVEFORM_SCHEMAS = [WaveformRequest, Waveform];
