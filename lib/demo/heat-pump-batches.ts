/** The heat-pump study's demo batches (invented): home results from the retrofit installers. */
import { INSULATION_BANDS, BUILDING_AGE_BANDS, HEAT_PUMP_TYPES } from "./plans";
import { rng, round, toCsv, type DemoBatch } from "./generate";

export const HEAT_HEADER = [
  "property_ref",
  "install_date",
  "installer_note",
  "annual_kwh_saved",
  "floor_area_m2",
  "pre_retrofit_kwh",
  "heat_pump_type",
  "insulation_band",
  "building_age_band",
  "household_size",
  "occupancy_hours",
] as const;
type HeatRow = Record<(typeof HEAT_HEADER)[number], string | number>;

export function heatPumpRows(prefix: string, n: number, seed: number): HeatRow[] {
  const r = rng(seed);
  const rows: HeatRow[] = [];
  for (let i = 0; i < n; i++) {
    const area = round(Math.max(30, 95 + r.normal() * 30), 1);
    const pre = round(Math.max(2500, area * 120 + r.normal() * 2500), 0);
    const type = r.pick(HEAT_PUMP_TYPES);
    const band = r.pick(INSULATION_BANDS);
    const age = r.pick(BUILDING_AGE_BANDS);
    const hh = Math.max(1, Math.min(7, Math.round(2.4 + r.normal() * 1.2)));
    const occ = round(Math.min(24, Math.max(4, 14 + r.normal() * 4)), 1);
    const saved =
      0.35 * pre +
      (type === "ground" ? 900 : type === "hybrid" ? -400 : 0) -
      60 * INSULATION_BANDS.indexOf(band) +
      35 * (occ - 14) +
      r.normal() * 1100;
    rows.push({
      property_ref: `${prefix}${String(10000 + i)}`,
      install_date: new Date(Date.UTC(2025, 3, 1 + Math.floor(r.next() * 200))).toISOString().slice(0, 10),
      installer_note: "",
      annual_kwh_saved: round(saved, 0),
      floor_area_m2: area,
      pre_retrofit_kwh: pre,
      heat_pump_type: type,
      insulation_band: band,
      building_age_band: age,
      household_size: hh,
      occupancy_hours: occ,
    });
  }
  return rows;
}

export function heatPumpBatches(): DemoBatch[] {
  return [
    {
      organisationSlug: "greenhearth",
      studySlug: "heat-pump-savings",
      title: "Greenhearth retrofits, 2025 installs",
      fileName: "greenhearth-2025.csv",
      shows: "a clean batch under stricter thresholds",
      decision: { by: "analyst2@lowmoor.test", decision: "accept" },
      csv: toCsv(HEAT_HEADER, heatPumpRows("GH-", 260, 707)),
    },
  ];
}
