/**
 * How a trial's arms are laid out: each arm one level of a single factor (the usual strain or
 * method comparison), or every combination of strains with fruiting methods, one arm each, so the
 * report can say whether the method matters, whether the strain does, and whether the best method
 * depends on the strain.
 */
export const trialDesignKinds = ["one_factor", "strain_by_method"] as const;
export type TrialDesignKind = (typeof trialDesignKinds)[number];

export const trialDesignKindLabels: Record<TrialDesignKind, string> = {
  one_factor: "One factor: each arm against the reference",
  strain_by_method: "Strains crossed with fruiting methods",
};
