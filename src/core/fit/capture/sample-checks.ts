import { CoreError } from '../../errors.ts';

/**
 * Reject samples the analysis cannot use. One NaN or infinity poisons every
 * sum, histogram and crossing search downstream, so it is better to stop and
 * name the first one than to return figures built on it.
 */
export function assertFiniteSamples(values: Float64Array, channelName: string, pointer?: string): void {
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (!Number.isFinite(v)) {
      const what = Number.isNaN(v) ? 'NaN' : String(v);
      throw new CoreError(
        'bad-capture',
        `${channelName} sample ${i} is ${what}: captures must hold finite numbers only`,
        pointer === undefined ? undefined : `${pointer}/${i}`,
        { channel: channelName, index: i, reason: 'non-finite-sample' },
      );
    }
  }
}
