/**
 * The state slots of a multi-state piece (docs/model.md, "Strays and leakage"): the capacitive nodes N
 * (the timing capacitor), P (the threshold node) and O (the output pin). A module of their own so that
 * modal.ts and modal-curved.ts, which import each other, both read them at load time.
 */
export const SLOT = { N: 0, P: 1, O: 2 } as const;
export const MAX_STATES = 3;
