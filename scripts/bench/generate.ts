/**
 * The benchmark's batch file: invented, shaped like what providers send rather than like what
 * suits the engine. A text key (P0000001…), three category columns in which a few rows carry
 * spelling variants (`Clay`, `clay `, `no till`), a free-text column of notes quoted because
 * they hold commas (now and then a doubled quote), an ISO sampling date and a lab date in one
 * provider's day/month/year style, twelve numeric columns written with the decimals people
 * type, about 3 % missing in four of them (empty, sometimes `NA`), CRLF line ends as a
 * spreadsheet on Windows saves them.
 */
import { createWriteStream } from "node:fs";
import { mulberry32, type PlanInput } from "@/lib/readiness";

/** Bump when the file's content changes, so a cached file is made again. */
export const GENERATOR_VERSION = 2;

export const SOILS = ["clay", "loam", "sand", "silt"];
export const VARIETIES = ["Amberlea", "Corrin", "Halvard", "Tessmoor"];
export const TILLAGE = ["plough", "min-till", "no-till"];
const VARIANTS: Record<string, string[]> = {
  soil: ["Clay", "clay ", "Loam", "sand "],
  variety: ["amberlea", "Corrin ", "HALVARD"],
  tillage: ["Plough", "no till", "min till"],
};
/** share of rows with a spelling variant, per category column */
const VARIANT_RATE = 0.0025;
/** share of missing values in each of the four gappy columns */
const MISSING_RATE = 0.03;

const NOTES = [
  "north edge, wet after rain",
  "resown after frost, 12 days late",
  "bird damage, netted in week 3",
  "headland plot, partly shaded",
  "drill blocked, gap in rows 4-6",
  "lodging after storm, harvested by hand",
  "sample bag torn, weight estimated",
  "grazed by deer, see photo log",
];
const QUOTED_NOTES = [
  'marked ""check"" by the lab, re-weighed',
  'field sheet says ""wet"", no rain recorded',
];

export const NUMERIC = [
  "nitrogen",
  "phosphorus",
  "potassium",
  "irrigation",
  "rainfall",
  "sowing_day",
  "density",
  "organic_matter",
  "ph",
  "temperature",
  "slope",
];
export const GAPPY = ["irrigation", "density", "organic_matter", "ph"];
export const RESPONSE = "yield";
export const FACTORS: Record<string, string[]> = { soil: SOILS, variety: VARIETIES, tillage: TILLAGE };

export const plan: PlanInput = {
  columns: [
    { name: "plot_code", role: "key", type: "text" },
    { name: "soil", role: "predictor", type: "category", levels: SOILS },
    { name: "variety", role: "predictor", type: "category", levels: VARIETIES },
    { name: "tillage", role: "predictor", type: "category", levels: TILLAGE },
    { name: "notes", role: "carry", type: "text" },
    { name: "sample_date", role: "carry", type: "date" },
    { name: "lab_received", role: "carry", type: "date", dateFormat: "dmy" },
    { name: "nitrogen", role: "predictor", type: "number", min: 0, max: 300 },
    { name: "phosphorus", role: "predictor", type: "number", min: 0 },
    { name: "potassium", role: "predictor", type: "number", min: 0 },
    { name: "irrigation", role: "predictor", type: "number", min: 0 },
    { name: "rainfall", role: "predictor", type: "number", min: 0 },
    { name: "sowing_day", role: "predictor", type: "integer", min: 1, max: 366 },
    { name: "density", role: "predictor", type: "number", min: 0 },
    { name: "organic_matter", role: "predictor", type: "number", min: 0 },
    { name: "ph", role: "predictor", type: "number", min: 3, max: 10 },
    { name: "temperature", role: "predictor", type: "number" },
    { name: "slope", role: "predictor", type: "number", min: 0 },
    { name: "yield", role: "response", type: "number", min: 0 },
  ],
};

const pad = (n: number, w = 2) => String(n).padStart(w, "0");

/** Write `rows` data rows (and the header) to `file`; resolves when the file is closed. */
export async function generate(file: string, rows: number, seed = 20261202): Promise<void> {
  const r = mulberry32(seed);
  const normal = () => Math.sqrt(-2 * Math.log(Math.max(r(), 1e-12))) * Math.cos(2 * Math.PI * r());
  const pick = <T>(xs: T[]) => xs[Math.floor(r() * xs.length)] as T;
  const level = (col: string, i: number) => (r() < VARIANT_RATE ? pick(VARIANTS[col]!) : FACTORS[col]![i]!);
  const gap = (v: string) => (r() < MISSING_RATE ? (r() < 0.2 ? "NA" : "") : v);
  const ws = createWriteStream(file);
  const write = (s: string) =>
    new Promise<void>((res) => (ws.write(s) ? res() : ws.once("drain", () => res())));
  await write(plan.columns.map((c) => c.name).join(",") + "\r\n");
  let buf = "";
  for (let i = 1; i <= rows; i++) {
    const si = Math.floor(r() * 4);
    const vi = Math.floor(r() * 4);
    const ti = Math.floor(r() * 3);
    const n = 40 + r() * 200;
    const p = 10 + r() * 50;
    const k = 60 + r() * 180;
    const irr = 20 + r() * 120;
    const rain = 150 + r() * 250;
    const sow = 60 + Math.floor(r() * 50);
    const dens = 220 + r() * 160;
    const om = 1 + r() * 5;
    const ph = 5.5 + r() * 2.5;
    const temp = 9 + r() * 8 + 0.01 * sow;
    const slope = r() * 12;
    const y =
      2 +
      0.012 * n +
      0.008 * p +
      0.002 * k +
      0.004 * irr +
      0.003 * rain -
      0.01 * sow +
      0.002 * dens +
      0.15 * om +
      0.1 * ph +
      0.05 * temp -
      0.02 * slope +
      [0, -0.3, 0.2, 0.1][si]! +
      [0, 0.25, -0.15, 0.4][vi]! +
      [0, 0.12, 0.2][ti]! +
      0.6 * normal();
    const note = r() < 0.25 ? `"${r() < 0.03 ? pick(QUOTED_NOTES) : pick(NOTES)}"` : "";
    const month = 3 + Math.floor(r() * 3);
    const day = 1 + Math.floor(r() * 28);
    const labDay = 1 + Math.floor(r() * 28);
    buf +=
      `P${pad(i, 7)},${level("soil", si)},${level("variety", vi)},${level("tillage", ti)},${note},2026-${pad(month)}-${pad(day)},${pad(labDay)}/${pad(month + 1)}/2026,` +
      `${n.toFixed(1)},${p.toFixed(1)},${k.toFixed(0)},${gap(irr.toFixed(1))},${rain.toFixed(1)},${sow},${gap(dens.toFixed(0))},${gap(om.toFixed(2))},${gap(ph.toFixed(2))},` +
      `${temp.toFixed(1)},${slope.toFixed(2)},${Math.max(0, y).toFixed(3)}\r\n`;
    if (buf.length > 1 << 20) {
      await write(buf);
      buf = "";
    }
  }
  await write(buf);
  await new Promise<void>((res) => ws.end(() => res()));
}
