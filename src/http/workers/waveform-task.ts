/**
 * The waveform, computed and written out in a worker thread: the time-domain
 * walk, the sampling and the serialised answer (JSON text or SVG) are all done
 * here, so a 200,000-sample request costs the event loop one buffer copy and
 * no number formatting. Core imports only (this module runs inside threads).
 */
import { CoreError } from '../../core/errors.ts';
import { prepareCircuit, waveformOfPrepared, type Circuit } from '../../core/index.ts';
import { renderWaveformSvg } from '../../core/plot/index.ts';

export interface WaveformTaskInput {
  circuit: Circuit;
  periods: number;
  samples: number;
  includePowerUp: boolean;
  /** Set for an SVG answer: the plot's title lines. */
  svg?: { title: string };
}

export interface WaveformTaskOutput {
  mediaType: 'application/json' | 'image/svg+xml';
  /** The whole answer body, UTF-8. */
  body: Uint8Array;
}

const encoder = new TextEncoder();

/** Comma-joined numbers of a typed array; every one finite (checked), so the text is plain JSON numbers. */
function numberList(values: Float64Array, name: string): string {
  for (let i = 0; i < values.length; i++) {
    if (!Number.isFinite(values[i])) {
      throw new CoreError('not-converged', `The time-domain engine produced a non-finite ${name} sample at index ${i}; the circuit is outside what the model describes`);
    }
  }
  return Array.prototype.join.call(values, ',');
}

function finite(value: number, name: string): number {
  if (!Number.isFinite(value)) throw new CoreError('not-converged', `The time-domain engine produced a non-finite ${name}`);
  return value;
}

export function waveformTask(input: WaveformTaskInput): WaveformTaskOutput {
  const prepared = prepareCircuit(input.circuit);
  const { samples, figures } = waveformOfPrepared(prepared, { periods: input.periods, samples: input.samples, includePowerUp: input.includePowerUp });
  const thresholds = { upperV: finite(figures.thresholds.upperV, 'upper threshold'), lowerV: finite(figures.thresholds.lowerV, 'lower threshold') };
  const frequencyHz = finite(figures.frequencyHz, 'frequency');
  const dutyCycle = finite(figures.dutyCycle, 'duty cycle');
  if (input.svg) {
    const svg = renderWaveformSvg({
      timeS: samples.timeS,
      traces: [
        { name: 'capacitor (N)', unit: 'V', values: samples.capacitorV },
        { name: 'output', unit: 'V', values: samples.outputV },
        { name: 'threshold node (P)', unit: 'V', values: samples.decisionV },
      ],
      thresholds,
      title: input.svg.title,
      subtitle: `${Number(frequencyHz.toPrecision(5))} Hz, duty ${Number((dutyCycle * 100).toPrecision(4))} %`,
    });
    return { mediaType: 'image/svg+xml', body: encoder.encode(svg) };
  }
  const head = JSON.stringify({
    model: 'time-domain',
    frequencyHz,
    periodS: finite(figures.periodS, 'period'),
    dutyCycle,
    thresholds,
    includePowerUp: input.includePowerUp,
  });
  const text =
    head.slice(0, -1) +
    `,"timeS":[${numberList(samples.timeS, 'time')}]` +
    `,"capacitorV":[${numberList(samples.capacitorV, 'capacitor voltage')}]` +
    `,"outputV":[${numberList(samples.outputV, 'output voltage')}]` +
    `,"decisionV":[${numberList(samples.decisionV, 'threshold-node voltage')}]}`;
  return { mediaType: 'application/json', body: encoder.encode(text) };
}
