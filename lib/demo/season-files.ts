/**
 * The season's batch files (invented): the demo's plot and home generators with the defects
 * providers really send — level spellings, a computed column, gaps, too few rows, -999 for
 * "not counted", floor areas in square feet — or clean.
 */
import {
  BARLEY_HEADER,
  BRACKENRIDGE_NITROGEN_RESPONSE,
  HEAT_HEADER,
  barleyRows,
  heatPumpRows,
  toCsv,
} from "./batches";

export type Defect = "clean" | "commas" | "variants" | "collinear" | "missing" | "few" | "sentinel" | "range";

const round1 = (x: number) => Math.round(x * 10) / 10;

/** One season file for `study`: `n` rows coded `code`, generated from `seed`, with `defect`. */
export function seasonCsv(study: string, code: string, n: number, seed: number, defect: Defect): string {
  return study === "heat-pump-savings" ? heatCsv(code, n, seed, defect) : barleyCsv(code, n, seed, defect);
}

function barleyCsv(code: string, n: number, seed: number, defect: Defect): string {
  // Brackenridge farms after a clover ley: its nitrogen response differs from the other farms',
  // which the pool's questions (poolability, influence) show on the barley pool
  const response = /^BR\d*$/.test(code) ? BRACKENRIDGE_NITROGEN_RESPONSE : 1;
  const rows = barleyRows(code, n, seed, response).map((row, i) => {
    switch (defect) {
      case "variants":
        return {
          ...row,
          soil: row.soil === "clay" ? (i % 3 === 0 ? "Clay" : i % 3 === 1 ? "clay " : "clay") : row.soil,
        };
      case "collinear":
        return { ...row, total_water_mm: round1(Number(row.irrigation_mm) + Number(row.rainfall_mm)) };
      case "missing":
        return i % 2 === 1 ? { ...row, irrigation_mm: "" } : row;
      case "sentinel":
        return i % 6 === 4 ? { ...row, plant_density: -999 } : row;
      default:
        return row;
    }
  });
  if (defect === "commas") return toCsv(BARLEY_HEADER, rows, ";").replace(/(\d)\.(\d)/g, "$1,$2");
  return toCsv(BARLEY_HEADER, rows);
}

function heatCsv(code: string, n: number, seed: number, defect: Defect): string {
  const rows = heatPumpRows(`${code}-`, n, seed).map((row, i) => {
    switch (defect) {
      case "missing":
        return i % 5 < 2 ? { ...row, occupancy_hours: "unknown" } : row;
      case "range":
        // the installer's survey sheet in square feet
        return i % 2 === 0 ? { ...row, floor_area_m2: Math.round(Number(row.floor_area_m2) * 10.764) } : row;
      default:
        return row;
    }
  });
  return toCsv(HEAT_HEADER, rows);
}
