/**
 * Diode-steered astable: the capacitor charges through rCharge and one diode
 * while the output is high and discharges through rDischarge and a second diode
 * while it is low, so the two dwell times — and the duty cycle — are set
 * independently. The threshold network is either arrangement of the plain
 * astables: rTop + rBottom + rFeedback (like three-resistor-divider)
 * or rFeedback + rGround (like two-resistor-feedback); which one is chosen
 * by the parts given.
 *
 * Each diode is piecewise linear (forward drop + series resistance while it
 * conducts, open otherwise). The series resistor and the diode resistance are
 * one branch, so no internal node is needed; the branch EMF is the forward drop.
 */
import { CoreError } from '../../errors.ts';
import { NODE } from '../nodes.ts';
import type { Branch } from '../network.ts';
import type { DiodeModel } from '../types.ts';
import { dividerThresholdBranches, ROLE, splitThresholdBranches } from './shared-parts.ts';
import { DIVIDER_NETWORK, FEEDBACK_NETWORK } from './threshold-networks.ts';
import type { TopologyDefinition } from './topology.ts';

/** Small-signal silicon diode, common practice (the HTTP layer uses the same default). */
export const DEFAULT_STEERING_DIODE: Readonly<DiodeModel> = Object.freeze({ forwardDropV: 0.6, resistanceOhm: 10 });

export const CHARGE_DIODE_LABEL = 'rCharge+diode';
export const DISCHARGE_DIODE_LABEL = 'rDischarge+diode';

function checkDiode(diode: DiodeModel): void {
  if (!Number.isFinite(diode.forwardDropV) || diode.forwardDropV < 0) {
    throw new CoreError('invalid-value', 'diode.forwardDropV must be a finite voltage >= 0', '/diode/forwardDropV');
  }
  if (!Number.isFinite(diode.resistanceOhm) || diode.resistanceOhm < 0) {
    throw new CoreError('invalid-value', 'diode.resistanceOhm must be a finite resistance >= 0', '/diode/resistanceOhm');
  }
}

/** The threshold network: single-rail divider when rTop is given, split-rail otherwise. */
function thresholdBranches(parts: Readonly<Record<string, number>>): Branch[] {
  const has = (role: string) => parts[role] !== undefined;
  if (has('rTop')) {
    if (!has('rBottom')) throw new CoreError('missing-part', "With rTop (single-rail arrangement) diode-steered needs rBottom", '/parts/rBottom');
    if (has('rGround')) throw new CoreError('unexpected-part', 'Give either rTop + rBottom (single rail) or rGround (split rails), not both', '/parts/rGround');
    return dividerThresholdBranches(parts);
  }
  if (has('rBottom')) throw new CoreError('missing-part', 'With rBottom (single-rail arrangement) diode-steered needs rTop', '/parts/rTop');
  if (!has('rGround')) {
    throw new CoreError('missing-part', 'diode-steered needs rGround (split rails) or rTop + rBottom (single rail)', '/parts/rGround');
  }
  return splitThresholdBranches(parts);
}

export const diodeSteered: TopologyDefinition = {
  id: 'diode-steered',
  description:
    'Separate charge and discharge paths: rCharge + diode (output to N, conducts while high) and rDischarge + diode (N to output, conducts while low) charge cTiming; thresholds from rTop + rBottom + rFeedback (single rail) or rFeedback + rGround (split rails). Diode: forward drop + resistance (`diode`, default 0.6 V, 10 Ω).',
  roles: {
    rCharge: { kind: 'resistor', description: 'charge-path resistor, in series with the charge diode from the output to N', required: true, purpose: 'timing' },
    rDischarge: { kind: 'resistor', description: 'discharge-path resistor, in series with the discharge diode from N to the output', required: true, purpose: 'timing' },
    cTiming: ROLE.cTiming,
    rFeedback: ROLE.rFeedback,
    rTop: { ...ROLE.rTop, description: `single-rail arrangement: ${ROLE.rTop.description}`, required: false },
    rBottom: { ...ROLE.rBottom, description: `single-rail arrangement: ${ROLE.rBottom.description}`, required: false },
    rGround: { ...ROLE.rGround, description: `split-rail arrangement: ${ROLE.rGround.description}`, required: false },
  },
  capacitorRole: 'cTiming',
  internalNodeCount: 0,
  diodeCount: 2,
  needsOpenDrain: false,
  diodeLabels: [CHARGE_DIODE_LABEL, DISCHARGE_DIODE_LABEL],
  branches(parts, piece, diode = DEFAULT_STEERING_DIODE) {
    checkDiode(diode);
    const on = piece.diodesOn ?? diodeSteered.nominalDiodes!(piece.state);
    const branches = thresholdBranches(parts);
    // Anode at the output for the charge diode, at N for the discharge diode.
    if (on[0]) branches.push({ from: NODE.output, to: NODE.capacitor, resistanceOhm: parts.rCharge + diode.resistanceOhm, emfV: diode.forwardDropV, label: CHARGE_DIODE_LABEL });
    if (on[1]) branches.push({ from: NODE.capacitor, to: NODE.output, resistanceOhm: parts.rDischarge + diode.resistanceOhm, emfV: diode.forwardDropV, label: DISCHARGE_DIODE_LABEL });
    return branches;
  },
  nominalDiodes(state) {
    return state === 'high' ? [true, false] : [false, true];
  },
  design: {
    timing: { kind: 'steered', charge: 'rCharge', discharge: 'rDischarge', capacitor: 'cTiming', defaultDiode: DEFAULT_STEERING_DIODE },
    // Around ground on split rails; the divider (thresholds centred on the swing) otherwise.
    thresholdNetworks: [FEEDBACK_NETWORK, DIVIDER_NETWORK],
  },
};
