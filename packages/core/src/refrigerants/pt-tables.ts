/** One row of a pressure–temperature table: gauge pressure at the standard atmosphere (14.696 psia). */
export interface PtRow {
  readonly tempF: number;
  readonly bubblePsig: number;
  readonly dewPsig: number;
}

/** A °C / kPa absolute row (bubble and dew equal for single compounds). */
export interface PtRowSi {
  readonly tempC: number;
  readonly bubbleKpaAbs: number;
  readonly dewKpaAbs: number;
}

const rows = (data: [number, number, number?][]): PtRow[] =>
  data.map(([tempF, bubblePsig, dewPsig]) => ({ tempF, bubblePsig, dewPsig: dewPsig ?? bubblePsig }));
const rowsSi = (data: [number, number, number?][]): PtRowSi[] =>
  data.map(([tempC, bubbleKpaAbs, dewKpaAbs]) => ({ tempC, bubbleKpaAbs, dewKpaAbs: dewKpaAbs ?? bubbleKpaAbs }));

/**
 * Saturation P-T tables, °F / psig.
 * Source: REFERENCE.md §6.3 (COMPUTED from the equations of state; matches the calcspec.com chart,
 * "Source NIST REFPROP" [S18], to 0.1 psig above atmospheric). Accuracy ±0.1 % (R-22, R-134a),
 * ±0.3 % (R-410A).
 */
export const PT_TABLES_F: Readonly<Record<string, readonly PtRow[]>> = {
  "R-22": rows([
    [-20, 10.2],
    [0, 24.0],
    [20, 43.1],
    [32, 57.5],
    [40, 68.6],
    [50, 84.1],
    [60, 101.6],
    [70, 121.4],
    [77, 136.7],
    [80, 143.6],
    [90, 168.4],
    [100, 195.9],
    [104, 207.7],
    [110, 226.4],
    [120, 260.0],
    [130, 296.9],
  ]),
  "R-134a": rows([
    [-20, -1.8],
    [0, 6.5],
    [20, 18.4],
    [32, 27.8],
    [40, 35.0],
    [50, 45.4],
    [60, 57.4],
    [70, 71.1],
    [77, 81.8],
    [80, 86.7],
    [90, 104.3],
    [100, 124.2],
    [104, 132.7],
    [110, 146.4],
    [120, 171.2],
    [130, 198.7],
  ]),
  "R-410A": rows([
    [-20, 26.3, 26.2],
    [0, 48.4, 48.2],
    [20, 78.7, 78.4],
    [32, 101.4, 101.1],
    [40, 118.8, 118.4],
    [50, 143.1, 142.6],
    [60, 170.7, 170.1],
    [70, 201.7, 201.1],
    [77, 225.7, 224.9],
    [80, 236.5, 235.7],
    [90, 275.3, 274.5],
    [100, 318.5, 317.6],
    [104, 337.1, 336.1],
    [110, 366.5, 365.4],
    [120, 419.5, 418.3],
    [130, 478.0, 476.8],
  ]),
};

/** The same tables in °C / kPa absolute. Source: REFERENCE.md §6.3 (SI table, COMPUTED). */
export const PT_TABLES_C: Readonly<Record<string, readonly PtRowSi[]>> = {
  "R-22": rowsSi([
    [-20, 245.3],
    [-10, 354.8],
    [0, 498.0],
    [10, 680.9],
    [20, 910.0],
    [25, 1043.9],
    [30, 1191.9],
    [40, 1533.6],
    [50, 1942.7],
  ]),
  "R-134a": rowsSi([
    [-20, 132.7],
    [-10, 200.6],
    [0, 292.8],
    [10, 414.6],
    [20, 571.7],
    [25, 665.4],
    [30, 770.2],
    [40, 1016.6],
    [50, 1317.9],
  ]),
  "R-410A": rowsSi([
    [-20, 400.7, 399.3],
    [-10, 574.6, 572.7],
    [0, 800.7, 798.1],
    [10, 1088.3, 1084.8],
    [20, 1447.5, 1442.9],
    [25, 1657.2, 1652.1],
    [30, 1889.1, 1883.4],
    [40, 2425.6, 2418.6],
    [50, 3071.1, 3063.0],
  ]),
};
