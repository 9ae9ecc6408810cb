import { OutOfTableRangeError } from "../errors";
import { psiaToPsig, psigToPsia } from "../units/pressure";
import { fahrenheitToRankine } from "../units/temperature";
import { normaliseDesignation } from "./normalise-designation";
import { PT_TABLES_F, type PtRow } from "./pt-tables";

export type SaturationColumn = "bubble" | "dew";

export function hasPtTable(designation: string): boolean {
  return PT_TABLES_F[normaliseDesignation(designation)] !== undefined;
}

/**
 * Saturation pressure (psig, standard atmosphere 14.696 psia) at `tempF`, interpolated in the
 * shipped table: ln(p_abs) linear in 1/T (Clausius–Clapeyron form), exact at every table row.
 * Returns null when no table is shipped; throws OutOfTableRangeError outside the table (no extrapolation).
 * Use the bubble (liquid) column for a liquid-containing cylinder of a zeotropic blend.
 */
export function saturationPressurePsig(designation: string, tempF: number, column: SaturationColumn = "bubble"): number | null {
  const table = PT_TABLES_F[normaliseDesignation(designation)];
  if (!table) return null;
  const first = table[0] as PtRow;
  const last = table[table.length - 1] as PtRow;
  if (!(tempF >= first.tempF && tempF <= last.tempF)) {
    throw new OutOfTableRangeError(`${tempF} °F is outside the P-T table (${first.tempF} to ${last.tempF} °F)`);
  }
  const pick = (row: PtRow) => (column === "bubble" ? row.bubblePsig : row.dewPsig);
  let i = 1;
  while (i < table.length - 1 && (table[i] as PtRow).tempF < tempF) i++;
  const hi = table[i] as PtRow;
  const lo = table[i - 1] as PtRow;
  if (tempF === hi.tempF) return pick(hi);
  if (tempF === lo.tempF) return pick(lo);
  const x = 1 / fahrenheitToRankine(tempF);
  const x0 = 1 / fahrenheitToRankine(lo.tempF);
  const x1 = 1 / fahrenheitToRankine(hi.tempF);
  const y0 = Math.log(psigToPsia(pick(lo)));
  const y1 = Math.log(psigToPsia(pick(hi)));
  return psiaToPsig(Math.exp(y0 + ((x - x0) / (x1 - x0)) * (y1 - y0)));
}
