/**
 * The data plans of the two demo studies (invented). Both are parsed with parsePlan at seed
 * time, so a plan that drifts from the schema stops the seed with the field at fault.
 */
import type { PlanInput } from "@/lib/readiness";

export const BARLEY_VARIETIES = ["Halden Gold", "Skerrow", "Brackwater", "Lowmoor Amber"] as const;
export const SOIL_TYPES = ["loam", "clay", "sand", "silt"] as const;

/** Spring barley: plot yield on nitrogen rate, water, soil, variety and husbandry. */
export const BARLEY_PLAN: PlanInput = {
  columns: [
    {
      name: "plot_id",
      role: "key",
      type: "text",
      description: "farm code and plot number, unique within a season",
    },
    {
      name: "harvest_date",
      role: "carry",
      type: "date",
      dateFormat: "iso",
      description: "day the plot was combined",
    },
    {
      name: "farm_plot_note",
      role: "carry",
      type: "text",
      description: "free text from the farm about the plot",
    },
    {
      name: "yield_t_ha",
      role: "response",
      type: "number",
      min: 0,
      max: 14,
      description: "grain yield at 15 % moisture, tonnes per hectare",
    },
    {
      name: "nitrogen_kg_ha",
      role: "predictor",
      type: "number",
      min: 0,
      max: 250,
      description: "nitrogen applied, kg N per hectare",
    },
    {
      name: "irrigation_mm",
      role: "predictor",
      type: "number",
      min: 0,
      max: 300,
      description: "irrigation over the season, mm",
    },
    {
      name: "rainfall_mm",
      role: "predictor",
      type: "number",
      min: 50,
      max: 700,
      description: "rainfall from sowing to harvest, mm",
    },
    {
      name: "total_water_mm",
      role: "predictor",
      type: "number",
      min: 0,
      max: 1000,
      description: "water that reached the plot over the season by the plot gauge, mm",
    },
    {
      name: "soil",
      role: "predictor",
      type: "category",
      levels: [...SOIL_TYPES],
      baseline: "loam",
      description: "dominant soil texture of the plot",
    },
    {
      name: "variety",
      role: "predictor",
      type: "category",
      levels: [...BARLEY_VARIETIES],
      baseline: "Halden Gold",
      description: "cultivar sown",
    },
    {
      name: "sowing_doy",
      role: "predictor",
      type: "integer",
      min: 32,
      max: 150,
      description: "sowing date as day of the year",
    },
    {
      name: "plant_density",
      role: "predictor",
      type: "number",
      min: 150,
      max: 450,
      description: "established plants per square metre",
    },
    {
      name: "organic_matter_pct",
      role: "predictor",
      type: "number",
      min: 0.5,
      max: 12,
      description: "soil organic matter, % by weight",
    },
  ],
  intercept: true,
  interactions: [],
  missingTokens: ["", "NA"],
  anticipatedR2: 0.35,
  outcome: { mean: 6.4, sd: 1.2 },
  // nitrogen is what the study is about: always in; the pool's selection preview weighs the rest
  selection: {
    candidates: [
      "irrigation_mm",
      "rainfall_mm",
      "total_water_mm",
      "soil",
      "variety",
      "sowing_doy",
      "plant_density",
      "organic_matter_pct",
    ],
    required: ["nitrogen_kg_ha"],
  },
  thresholds: {
    dfTarget: 150,
    dfFloor: 20,
    perParameter: 10,
    missingWarning: 0.1,
    missingBlocker: 0.4,
    sparseLevel: 10,
    pairCorrelation: 0.9,
  },
};

export const HEAT_PUMP_TYPES = ["air", "ground", "hybrid"] as const;
export const INSULATION_BANDS = ["A-B", "C", "D", "E", "F-G"] as const;
export const BUILDING_AGE_BANDS = [
  "pre-1919",
  "1919-1944",
  "1945-1964",
  "1965-1990",
  "1991-onwards",
] as const;

/** Heat-pump retrofits: first-year energy saved on the home and its household. Stricter thresholds. */
export const HEAT_PUMP_PLAN: PlanInput = {
  columns: [
    { name: "property_ref", role: "key", type: "text", description: "the agency's reference of the home" },
    {
      name: "install_date",
      role: "carry",
      type: "date",
      dateFormat: "iso",
      description: "day the heat pump was commissioned",
    },
    { name: "installer_note", role: "carry", type: "text", description: "free text from the installer" },
    {
      name: "annual_kwh_saved",
      role: "response",
      type: "number",
      min: -3000,
      max: 30000,
      description: "metered energy saved in the first year, kWh",
    },
    {
      name: "floor_area_m2",
      role: "predictor",
      type: "number",
      min: 25,
      max: 500,
      description: "heated floor area, square metres",
    },
    {
      name: "pre_retrofit_kwh",
      role: "predictor",
      type: "number",
      min: 2000,
      max: 60000,
      description: "metered heating energy in the year before, kWh",
    },
    {
      name: "heat_pump_type",
      role: "predictor",
      type: "category",
      levels: [...HEAT_PUMP_TYPES],
      baseline: "air",
      description: "air source, ground source or hybrid with a boiler",
    },
    {
      name: "insulation_band",
      role: "predictor",
      type: "category",
      levels: [...INSULATION_BANDS],
      baseline: "D",
      description: "fabric efficiency band from the survey",
    },
    {
      name: "building_age_band",
      role: "predictor",
      type: "category",
      levels: [...BUILDING_AGE_BANDS],
      baseline: "1945-1964",
      description: "construction period",
    },
    {
      name: "household_size",
      role: "predictor",
      type: "integer",
      min: 1,
      max: 9,
      description: "people living in the home",
    },
    {
      name: "occupancy_hours",
      role: "predictor",
      type: "number",
      min: 0,
      max: 24,
      description: "average hours a day someone is at home",
    },
  ],
  intercept: true,
  interactions: [],
  missingTokens: ["", "NA", "unknown"],
  anticipatedR2: 0.25,
  outcome: { mean: 3400, sd: 1500 },
  thresholds: {
    dfTarget: 200,
    dfFloor: 15,
    perParameter: 15,
    missingWarning: 0.08,
    missingBlocker: 0.3,
    sparseLevel: 8,
    pairCorrelation: 0.85,
    vifWarning: 4,
  },
};
