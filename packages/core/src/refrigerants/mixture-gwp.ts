import { CoreInputError, UnknownRefrigerantError } from "../errors";
import { BLEND_COMPONENT_GWPS, getRefrigerant, type GwpBasis, type GwpValues } from "./catalogue";
import { normaliseDesignation } from "./normalise-designation";

export interface GwpComponent {
  massPercent: number;
  gwp: number;
}

/**
 * GWP of a mixture: the mass-weighted sum Σ(w_i × GWP_i), w in mass %.
 * Source: Regulation (EU) 517/2014 Annex IV; 842/2006 Annex I Part 2 (REFERENCE.md §7 [S26]).
 * Percentages must add up to 100 ± 1 (the weight tolerance the regulation allows).
 */
export function mixtureGwp(components: readonly GwpComponent[]): number {
  const total = components.reduce((s, x) => s + x.massPercent, 0);
  if (components.length === 0 || Math.abs(total - 100) > 1) {
    throw new CoreInputError(`Mass percentages add up to ${total}, not 100`, "components");
  }
  return components.reduce((s, x) => s + (x.massPercent / 100) * x.gwp, 0);
}

function componentGwp(designation: string): GwpValues | undefined {
  return getRefrigerant(designation)?.gwp ?? BLEND_COMPONENT_GWPS[normaliseDesignation(designation)];
}

/**
 * Unrounded GWP of a catalogued blend recomputed from its components. `bases` lists the bases to
 * try per component in order (e.g. ["ar4", "eu"] uses the EU figure for an HFO that AR4 did not assess).
 */
export function blendGwp(designation: string, bases: readonly GwpBasis[]): number {
  const refrigerant = getRefrigerant(designation);
  if (!refrigerant) throw new UnknownRefrigerantError(designation);
  if (!refrigerant.composition) throw new CoreInputError(`${refrigerant.designation} is not a blend`, "designation");
  return mixtureGwp(
    refrigerant.composition.map((component) => {
      const values = componentGwp(component.designation);
      const value = values ? bases.map((b) => values[b]).find((v): v is number => v !== null) : undefined;
      if (value === undefined) {
        throw new CoreInputError(`No ${bases.join("/")} GWP for component ${component.designation}`, "bases");
      }
      return { massPercent: component.massPercent, gwp: value };
    }),
  );
}
