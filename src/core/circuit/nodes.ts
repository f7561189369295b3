/**
 * Fixed node numbering shared by every topology, so the network builder,
 * the solvers and the engine agree without lookups.
 */
export const NODE = {
  ground: 0,
  positiveRail: 1,
  negativeRail: 2,
  /** Ideal source inside the output stage (its saturation level). */
  source: 3,
  /** The output pin, behind the output resistance. */
  output: 4,
  /** Non-inverting input: the decision node. */
  decision: 5,
  /** Inverting input: the timing-capacitor node. */
  capacitor: 6,
  /** Return point of an external output load. */
  loadReturn: 7,
  /** First free index for topology-internal nodes. */
  firstInternal: 8,
} as const;
