/** An encapsulation coating thinned as parts of cap material to parts of solvent, by volume. */
export interface CoatingDilution {
  capParts: number;
  solventParts: number;
}

/** Millilitres to measure of each, and the amount they make. */
export interface CoatingVolumes {
  capMl: number;
  solventMl: number;
  totalMl: number;
}

/** Millilitres of cap material and solvent for a target amount: each takes its share of all the parts. */
export function coatingVolumes(dilution: CoatingDilution, targetMl: number): CoatingVolumes {
  const parts = dilution.capParts + dilution.solventParts;
  return {
    capMl: (targetMl * dilution.capParts) / parts,
    solventMl: (targetMl * dilution.solventParts) / parts,
    totalMl: targetMl,
  };
}
