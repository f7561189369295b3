import { CoreError } from '../../errors.ts';
import type { CaptureChannel } from './csv.ts';

/**
 * Pick the amplifier-output and timing-capacitor channels out of a parsed
 * capture: by explicit names when the caller gives them, otherwise by name
 * hints, then by scope channel number (CH1 output, CH2 capacitor, the usual
 * probing order on a bench - common practice, our default), and for a
 * two-channel file with anonymous columns by column order.
 */
export interface ChannelChoice {
  /** Exact channel name (case-insensitive) for the output / capacitor, if known. */
  output?: string;
  capacitor?: string;
}

export interface MappedChannels {
  output?: CaptureChannel;
  capacitor?: CaptureChannel;
  /** How each choice was made. */
  notes: string[];
}

const OUTPUT_HINT = /out|square|sq\b|comp/i;
const CAPACITOR_HINT = /cap|timing|ramp|\btri|^v_?c$|^vc\b|\bc_?t\b/i;
const CHANNEL_ONE = /^(?:ch(?:annel)?|c)?\s*[_-]?\s*0*1$/i;
const CHANNEL_TWO = /^(?:ch(?:annel)?|c)?\s*[_-]?\s*0*2$/i;

function findByName(channels: readonly CaptureChannel[], name: string, role: string): CaptureChannel {
  const want = name.trim().toLowerCase();
  const hit = channels.find((c) => c.name.trim().toLowerCase() === want);
  if (hit === undefined) {
    throw new CoreError(
      'unknown-reference',
      `no channel named "${name}" for the ${role}; the capture has ${channels.map((c) => `"${c.name}"`).join(', ')}`,
      undefined,
      { role, name, available: channels.map((c) => c.name) },
    );
  }
  return hit;
}

export function mapChannels(channels: readonly CaptureChannel[], choice: ChannelChoice = {}): MappedChannels {
  const notes: string[] = [];
  let output = choice.output === undefined ? undefined : findByName(channels, choice.output, 'output');
  let capacitor = choice.capacitor === undefined ? undefined : findByName(channels, choice.capacitor, 'capacitor');
  if (output !== undefined) notes.push(`output: channel "${output.name}" (named by the caller)`);
  if (capacitor !== undefined) notes.push(`capacitor: channel "${capacitor.name}" (named by the caller)`);
  if (output !== undefined && output === capacitor) {
    throw new CoreError('invalid-value', `channel "${output.name}" cannot be both the output and the capacitor`);
  }
  const free = (c: CaptureChannel): boolean => c !== output && c !== capacitor;

  const pick = (pattern: RegExp, how: string, role: 'output' | 'capacitor', exclude?: RegExp): void => {
    if ((role === 'output' ? output : capacitor) !== undefined) return;
    const candidates = channels.filter((c) => free(c) && pattern.test(c.name) && !(exclude?.test(c.name) ?? false));
    if (candidates.length !== 1) return;
    if (role === 'output') output = candidates[0];
    else capacitor = candidates[0];
    notes.push(`${role}: channel "${candidates[0].name}" (${how})`);
  };
  pick(CAPACITOR_HINT, 'name suggests the capacitor', 'capacitor', OUTPUT_HINT);
  pick(OUTPUT_HINT, 'name suggests the output', 'output', CAPACITOR_HINT);
  pick(CHANNEL_ONE, 'scope channel 1 taken as the output', 'output');
  pick(CHANNEL_TWO, 'scope channel 2 taken as the capacitor', 'capacitor');

  if (output === undefined && capacitor === undefined) {
    if (channels.length === 2) {
      output = channels[0];
      capacitor = channels[1];
      notes.push(`output: channel "${output.name}", capacitor: channel "${capacitor.name}" (by column order)`);
    } else if (channels.length === 1) {
      output = channels[0];
      notes.push(`output: channel "${output.name}" (the only channel; name it as the capacitor if it is not the output)`);
    }
  }
  if (output === undefined && capacitor === undefined) {
    throw new CoreError(
      'bad-capture',
      `cannot tell which of ${channels.length} channels is the output or the capacitor; name them explicitly`,
      undefined,
      { reason: 'ambiguous-channels', available: channels.map((c) => c.name) },
    );
  }
  const result: MappedChannels = { notes };
  if (output !== undefined) result.output = output;
  if (capacitor !== undefined) result.capacitor = capacitor;
  return result;
}
