/**
 * The demo scenario's batch files, generated (all invented): plot results from the
 * Lowmoor Valley farms (here) and home results from the heat-pump installers
 * (heat-pump-batches.ts), some clean and some with the defects providers really send.
 */
import { BARLEY_VARIETIES, SOIL_TYPES } from "./plans";
import { rng, round, toCsv, type DemoBatch } from "./generate";
import { heatPumpBatches } from "./heat-pump-batches";

export { rng, toCsv, type DemoBatch } from "./generate";
export { HEAT_HEADER, heatPumpBatches, heatPumpRows } from "./heat-pump-batches";

export const BARLEY_HEADER = [
  "plot_id",
  "harvest_date",
  "farm_plot_note",
  "yield_t_ha",
  "nitrogen_kg_ha",
  "irrigation_mm",
  "rainfall_mm",
  "total_water_mm",
  "soil",
  "variety",
  "sowing_doy",
  "plant_density",
  "organic_matter_pct",
] as const;
type BarleyRow = Record<(typeof BARLEY_HEADER)[number], string | number>;

/** Brackenridge's plots follow a clover ley: their yield rises with nitrogen at 0.3 of the valley's usual rate. */
export const BRACKENRIDGE_NITROGEN_RESPONSE = 0.3;

const SOIL_EFFECT: Record<string, number> = { loam: 0, clay: -0.35, sand: -0.6, silt: 0.15 };
const VARIETY_EFFECT = [0, 0.3, -0.2, 0.45];

/**
 * One season of invented plot results for a farm. `nitrogenResponse` scales the yield's
 * response to nitrogen (1: the valley's usual curve; near 0: plots that hardly respond).
 */
export function barleyRows(farmCode: string, n: number, seed: number, nitrogenResponse = 1): BarleyRow[] {
  const r = rng(seed);
  const rows: BarleyRow[] = [];
  for (let i = 0; i < n; i++) {
    const nitrogen = round(20 + r.next() * 200, 0);
    const irrigation = round(Math.max(0, 60 + r.normal() * 35), 1);
    const rainfall = round(Math.min(690, Math.max(80, 260 + r.normal() * 70)), 1);
    // the plot gauge: what reached the root zone after run-off and drift, which varies from plot to plot
    const totalWater = round(
      Math.max(40, 0.8 * irrigation + rainfall * (0.45 + 0.5 * r.next()) + r.normal() * 30),
      1,
    );
    const soil = r.pick(SOIL_TYPES);
    const vi = Math.floor(r.next() * BARLEY_VARIETIES.length);
    const sowing = Math.round(55 + r.next() * 80);
    const density = round(Math.min(420, Math.max(160, 220 + r.normal() * 40)), 0);
    const om = round(Math.max(0.8, 3.2 + r.normal() * 1.1), 2);
    const y =
      2.2 +
      nitrogenResponse * (0.016 * nitrogen - 0.00003 * nitrogen * nitrogen) +
      0.004 * irrigation +
      0.0035 * rainfall +
      (SOIL_EFFECT[soil] ?? 0) +
      (VARIETY_EFFECT[vi] ?? 0) -
      0.012 * (sowing - 90) +
      0.002 * (density - 220) +
      0.12 * om +
      r.normal() * 0.45;
    const day = 200 + Math.floor(r.next() * 30);
    const date = new Date(Date.UTC(2026, 0, day)).toISOString().slice(0, 10);
    rows.push({
      plot_id: `${farmCode}-${String(i + 1).padStart(3, "0")}`,
      harvest_date: date,
      farm_plot_note: r.next() < 0.08 ? "headland, some lodging" : "",
      yield_t_ha: round(Math.max(0.5, y), 2),
      nitrogen_kg_ha: nitrogen,
      irrigation_mm: irrigation,
      rainfall_mm: rainfall,
      total_water_mm: totalWater,
      soil,
      variety: BARLEY_VARIETIES[vi] as string,
      sowing_doy: sowing,
      plant_density: density,
      organic_matter_pct: om,
    });
  }
  return rows;
}

/** The barley batches of the demo, one per farm (two from Harrowgate and Coldwell), each with its story. */
export function barleyBatches(): DemoBatch[] {
  const h = BARLEY_HEADER;
  const clean1 = barleyRows("HG", 180, 101);

  // level spelling variants and a total_water column the farm computed as irrigation + rainfall
  const fennick = barleyRows("FH", 160, 202).map((row, i) => ({
    ...row,
    soil: row.soil === "clay" ? (i % 3 === 0 ? "Clay" : i % 3 === 1 ? "clay " : "clay") : row.soil,
    total_water_mm: round(Number(row.irrigation_mm) + Number(row.rainfall_mm), 1),
  }));

  // a third of irrigation missing, and plots after a clover ley whose yield hardly rises with nitrogen:
  // the pool's questions flag this batch (its nitrogen response differs from the other farms')
  const bracken = barleyRows("BR", 150, 303, BRACKENRIDGE_NITROGEN_RESPONSE).map((row, i) =>
    i % 3 === 1 ? { ...row, irrigation_mm: "" } : row,
  );

  // too small for the model
  const otter = barleyRows("OM", 14, 404);

  // semicolons with decimal commas, and -999 for plant density not counted
  const salt = barleyRows("SE", 140, 505).map((row, i) => ({
    ...row,
    plant_density: i % 11 === 4 ? -999 : row.plant_density,
  }));
  const saltCsv = toCsv(h, salt, ";").replace(/(\d)\.(\d)/g, "$1,$2");

  const coldwell = barleyRows("CW", 240, 606);
  // second trial fields of two farms: a provider's batches are tested together too
  const harrowgateLong = barleyRows("HL", 150, 111);
  const coldwellTop = barleyRows("CT", 130, 616);

  const study = "barley-nitrogen";
  return [
    {
      organisationSlug: "harrowgate",
      studySlug: study,
      title: "Harrowgate plots, spring 2026",
      fileName: "harrowgate-2026.csv",
      shows: "a clean batch",
      csv: toCsv(h, clean1),
      decision: { by: "analyst@lowmoor.test", decision: "accept" },
    },
    {
      organisationSlug: "fennick-hill",
      studySlug: study,
      title: "Fennick Hill plots, spring 2026",
      fileName: "fennick-hill-2026.csv",
      shows: "level spelling variants (Clay, clay ) and total_water_mm = irrigation_mm + rainfall_mm",
      csv: toCsv(h, fennick),
      decision: {
        by: "analyst@lowmoor.test",
        decision: "bounce",
        comment: "Two fixes before this batch can join the pool; the rest looks good.",
        findingComments: [
          {
            code: "level.variant",
            columns: ["soil"],
            comment: "Write the soil level as clay: lower case, no trailing space.",
          },
          {
            code: "collinear.exact",
            columns: ["total_water_mm"],
            comment: "Send the plot gauge reading here, not irrigation plus rainfall.",
          },
        ],
      },
    },
    {
      organisationSlug: "brackenridge",
      studySlug: study,
      title: "Brackenridge plots, spring 2026",
      fileName: "brackenridge-2026.csv",
      shows:
        "a third of irrigation_mm missing, and a nitrogen response unlike the other farms' (after a clover ley)",
      csv: toCsv(h, bracken),
      decision: {
        by: "analyst@lowmoor.test",
        decision: "accept",
        comment: "Accepted: the plots without an irrigation figure stay out of the complete cases.",
      },
    },
    {
      organisationSlug: "hollinsfold",
      studySlug: study,
      title: "Hollinsfold plots, spring 2026",
      fileName: "hollinsfold-2026.csv",
      shows: "too few plots for the model",
      csv: toCsv(h, otter),
    },
    {
      organisationSlug: "saltmarsh-end",
      studySlug: study,
      title: "Saltmarsh End plots, spring 2026",
      fileName: "saltmarsh-end-2026.csv",
      shows: "decimal commas and -999 sentinels",
      csv: saltCsv,
    },
    {
      organisationSlug: "coldwell",
      studySlug: study,
      title: "Coldwell plots, spring 2026",
      fileName: "coldwell-2026.csv",
      shows: "a clean batch",
      csv: toCsv(h, coldwell),
      decision: { by: "analyst@lowmoor.test", decision: "accept" },
    },
    {
      organisationSlug: "harrowgate",
      studySlug: study,
      title: "Harrowgate plots, Long Meadow trial 2026",
      fileName: "harrowgate-long-meadow-2026.csv",
      shows: "a clean second batch of the same farm",
      csv: toCsv(h, harrowgateLong),
      decision: { by: "analyst@lowmoor.test", decision: "accept" },
    },
    {
      organisationSlug: "coldwell",
      studySlug: study,
      title: "Coldwell plots, Top Field trial 2026",
      fileName: "coldwell-top-field-2026.csv",
      shows: "a clean second batch of the same farm",
      csv: toCsv(h, coldwellTop),
      decision: { by: "analyst@lowmoor.test", decision: "accept" },
    },
  ];
}

export function demoBatches(): DemoBatch[] {
  return [...barleyBatches(), ...heatPumpBatches()];
}
