/**
 * How a trial's arms are laid out: each arm one level of a single factor (the usual strain or
 * method comparison), or every combination of strains with fruiting methods, one arm each, so the
 * report can say whether the method matters, whether the strain does, and whether the best method
 * depends on the strain; or a room-level treatment ("rooms"): each arm a climate regime, and a
 * farm's fruiting rooms, not its blocks, are randomised to the arms, so the sample size and the
 * analysis count rooms.
 */
export const trialDesignKinds = ["one_factor", "strain_by_method", "rooms"] as const;
export type TrialDesignKind = (typeof trialDesignKinds)[number];

export const trialDesignKindLabels: Record<TrialDesignKind, string> = {
  one_factor: "One factor: each arm against the reference",
  strain_by_method: "Strains crossed with fruiting methods",
  rooms: "Rooms randomised to climate regimes",
};
