/**
 * The command line, `tributary-check` (lib/readiness/cli, the package's bin): exit 0 without
 * blockers, 1 with blockers, 2 for an unreadable file or bad usage (issue 3, point 8); --json
 * prints the report alone; --draft-plan a plan; arguments as node:util parseArgs reads them
 * (`--opt value` and `--opt=value`); `-` is standard input; progress only on a terminal.
 */
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { beforeAll, describe, expect, test } from "vitest";
import { ENGINE_VERSION, checkBatch, parsePlan, poolQuestions, type PoolMember } from "@/lib/readiness";
import { HEADER, chunks, cleanRows, csvOf, plan as planOf, planInput } from "../fixtures/engine/data";
import { PROCESS_PATIENCE_MS } from "../helpers/processes";

const BIN = path.resolve("lib/readiness/bin/tributary-check.mjs");
const dir = fs.mkdtempSync(path.join(os.tmpdir(), "tributary-cli-"));
const f = (name: string) => path.join(dir, name);

function cli(...args: string[]) {
  return cliWith({}, ...args);
}

function cliWith(opts: { input?: string }, ...args: string[]) {
  const r = spawnSync(process.execPath, [BIN, ...args], {
    encoding: "utf8",
    timeout: PROCESS_PATIENCE_MS,
    input: opts.input,
  });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

beforeAll(() => {
  fs.writeFileSync(f("plan.json"), JSON.stringify(planInput()));
  fs.writeFileSync(
    f("bad-plan.json"),
    JSON.stringify({
      columns: [
        { name: "a", role: "response", type: "number" },
        { name: "b", role: "response", type: "category", levels: ["x"], baseline: "y" },
      ],
    }),
  );
  fs.writeFileSync(f("clean.csv"), csvOf(HEADER, cleanRows(200)));
  const bad = cleanRows(200);
  bad[3]![HEADER.indexOf("soil")] = "peat";
  fs.writeFileSync(f("blocker.csv"), csvOf(HEADER, bad));
  fs.writeFileSync(f("book.csv"), Buffer.from([0x50, 0x4b, 0x03, 0x04, 0, 0, 0, 0, 0, 0]));
});

describe("exit codes", () => {
  test.each([
    {
      name: "clean file → 0",
      args: () => [f("clean.csv"), "--plan", f("plan.json")],
      code: 0,
      out: /0 blockers/,
    },
    {
      name: "a blocker → 1",
      args: () => [f("blocker.csv"), "--plan", f("plan.json")],
      code: 1,
      out: /\[BLOCKER\] level\.unknown \(soil\)[\s\S]*rows: 5/,
    },
    {
      name: "unreadable file → 2",
      args: () => [f("book.csv"), "--plan", f("plan.json")],
      code: 2,
      out: /Excel workbook/,
    },
    {
      name: "missing file → 2",
      args: () => [f("nope.csv"), "--plan", f("plan.json")],
      code: 2,
      err: /no such file/,
    },
    { name: "no plan → 2", args: () => [f("clean.csv")], code: 2, err: /--plan PLAN\.json is required/ },
    {
      name: "unknown option → 2",
      args: () => [f("clean.csv"), "--frobnicate"],
      code: 2,
      err: /unknown option --frobnicate/,
    },
    {
      name: "--plan without its file → 2",
      args: () => [f("clean.csv"), "--plan"],
      code: 2,
      err: /--plan needs a file name/,
    },
    {
      name: "a value given to a switch → 2",
      args: () => [f("clean.csv"), "--plan", f("plan.json"), "--json=yes"],
      code: 2,
      err: /--json takes no value/,
    },
    {
      name: "--workers out of range → 2",
      args: () => [f("clean.csv"), "--plan", f("plan.json"), "--workers", "0"],
      code: 2,
      err: /--workers needs a whole number from 1 to 16/,
    },
    {
      name: "two files without --pool → 2",
      args: () => [f("clean.csv"), f("blocker.csv"), "--plan", f("plan.json")],
      code: 2,
      err: /only one file at a time[\s\S]*--pool/,
    },
    {
      name: "--opt=value works like --opt value",
      args: () => [f("blocker.csv"), `--plan=${f("plan.json")}`, "--workers=2"],
      code: 1,
      out: /level\.unknown \(soil\)/,
    },
    {
      name: "invalid plan → 2 with field messages",
      args: () => [f("clean.csv"), "--plan", f("bad-plan.json")],
      code: 2,
      err: /columns\.1\.baseline: baseline "y" is not among the levels[\s\S]*exactly one response/,
    },
  ])("$name", ({ args, code, out, err }) => {
    const r = cli(...args());
    expect(r.code, r.err).toBe(code);
    if (out) expect(r.out).toMatch(out);
    if (err) expect(r.err).toMatch(err);
  });
});

describe("output modes", () => {
  test("--json prints the report JSON alone", () => {
    const r = cli(f("blocker.csv"), "--plan", f("plan.json"), "--json");
    expect(r.code).toBe(1);
    const rep = JSON.parse(r.out);
    expect(rep.status).toBe("checked");
    expect(rep.rows).toEqual({ total: 200, complete: 199 });
    expect(rep.findings[0].code).toBe("level.unknown");
  });

  test("--draft-plan proposes levels by frequency, the most frequent as baseline, and a valid plan once the response is named", () => {
    const r = cli(f("clean.csv"), "--draft-plan", "--response", "yield");
    expect(r.code).toBe(0);
    const draft = JSON.parse(r.out);
    const soil = draft.columns.find((c: { name: string }) => c.name === "soil");
    expect(soil).toMatchObject({ role: "predictor", type: "category", baseline: soil.levels[0] });
    expect(soil.levels.sort()).toEqual(["clay", "loam", "sand", "silt"]);
    expect(draft.columns.find((c: { name: string }) => c.name === "plot_id")).toMatchObject({
      role: "key",
      type: "integer",
    });
    expect(draft.columns.find((c: { name: string }) => c.name === "sow_date")).toMatchObject({
      type: "date",
    });
    const nitrogen = draft.columns.find((c: { name: string }) => c.name === "nitrogen");
    const values = cleanRows(200).map((x) => Number(x[HEADER.indexOf("nitrogen")]));
    expect(nitrogen).toMatchObject({ type: "number", min: Math.min(...values), max: Math.max(...values) });
    expect(parsePlan(draft).ok).toBe(true);
  });
});

describe("standard input, --version, progress and npx", () => {
  test("`-` reads the batch from standard input: the same report as from the file", () => {
    const fromFile = JSON.parse(cli(f("blocker.csv"), "--plan", f("plan.json"), "--json").out);
    const r = cliWith(
      { input: fs.readFileSync(f("blocker.csv"), "utf8") },
      "-",
      "--plan",
      f("plan.json"),
      "--json",
    );
    expect(r.code, r.err).toBe(1);
    const fromStdin = JSON.parse(r.out);
    expect(fromStdin.rows).toEqual(fromFile.rows);
    expect(fromStdin.findings).toEqual(fromFile.findings);
    expect(fromStdin.fit).toEqual(fromFile.fit);
  });

  test("`-` also drafts a plan from standard input", () => {
    const r = cliWith(
      { input: fs.readFileSync(f("clean.csv"), "utf8") },
      "-",
      "--draft-plan",
      "--response",
      "yield",
    );
    expect(r.code, r.err).toBe(0);
    expect(parsePlan(JSON.parse(r.out)).ok).toBe(true);
  });

  test("--version names the package's version, which is the engine's checks version", () => {
    const pkg = JSON.parse(fs.readFileSync("lib/readiness/package.json", "utf8"));
    // bump lib/readiness/package.json "version" together with ENGINE_VERSION (lib/readiness/check.ts)
    expect(pkg.version).toBe(ENGINE_VERSION);
    const r = cli("--version");
    expect(r.code).toBe(0);
    expect(r.out).toBe(`tributary-check ${pkg.version} (checks ${ENGINE_VERSION}, report format 1)\n`);
  });

  test("no progress on standard error when it is not a terminal (a pipe)", () => {
    fs.writeFileSync(f("large.csv"), csvOf(HEADER, cleanRows(25_000)));
    expect(fs.statSync(f("large.csv")).size).toBeGreaterThan(1 << 20);
    const piped = cli(f("large.csv"), "--plan", f("plan.json"), "--json");
    expect(piped.code).toBe(0);
    expect(piped.err).toBe("");
  });

  // the same command on a pseudo-terminal made by util-linux `script`: the progress line appears
  const hasScript = spawnSync("script", ["--version"]).status === 0;
  test.skipIf(!hasScript)("progress on standard error when it is a terminal", () => {
    if (!fs.existsSync(f("large.csv"))) fs.writeFileSync(f("large.csv"), csvOf(HEADER, cleanRows(25_000)));
    const cmd = [process.execPath, BIN, f("large.csv"), "--plan", f("plan.json"), "--json"]
      .map((a) => `'${a}'`)
      .join(" ");
    const tty = spawnSync("script", ["-qec", `${cmd} >/dev/null`, "/dev/null"], {
      encoding: "utf8",
      timeout: 60_000,
    });
    expect(tty.status, tty.stderr).toBe(0);
    expect(tty.stdout).toMatch(/large\.csv: read [\d,]+ rows, \d+ %/);
  });

  test("npx tributary-check runs the package's bin from the checkout (npm workspaces link it)", () => {
    const r = spawnSync("npx", ["--no-install", "tributary-check", "--version"], {
      encoding: "utf8",
      timeout: 60_000,
    });
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/^tributary-check \d+\.\d+\.\d+ /);
  });
});

describe("--pool: several files, each one batch, pooled from their states", () => {
  const selection = {
    selection: { candidates: ["soil", "variety", "nitrogen", "irrigation", "rainfall"], required: [] },
  };
  const names = ["north.csv", "south.csv", "east.csv"];
  beforeAll(() => {
    fs.writeFileSync(f("select-plan.json"), JSON.stringify(planInput(selection)));
    names.forEach((name, i) =>
      fs.writeFileSync(f(name), csvOf(HEADER, cleanRows(150, 21 + i, 1 + 1000 * i))),
    );
  });

  test("the JSON holds poolability, influence and selection, equal to poolQuestions on the files' own states", async () => {
    const r = cli(...names.map(f), "--pool", "--plan", f("select-plan.json"), "--json");
    expect(r.code, r.err).toBe(0);
    const out = JSON.parse(r.out);
    expect(out.files.map((x: { file: string }) => path.basename(x.file))).toEqual(names);
    // independently: each file checked by checkBatch, its state pooled by poolQuestions
    const p = planOf(selection);
    const members: PoolMember[] = [];
    for (const [i, name] of names.entries()) {
      const rep = await checkBatch(chunks(fs.readFileSync(f(name))), p);
      members.push({
        id: String(i + 1),
        label: f(name),
        group: "files",
        groupLabel: "these files",
        state: rep.state as PoolMember["state"],
      });
    }
    const q = JSON.parse(JSON.stringify(poolQuestions(members, p)));
    expect(out.poolability).toEqual(q.poolability);
    expect(out.influence).toEqual(q.influence);
    expect(out.selection).toEqual(q.selection);
    expect(out.selection.picks.length).toBeGreaterThan(0);
    expect(out.poolability.batches).toHaveLength(3);
  });

  test("the pool's fit is the fit of the three files stacked into one (the states merge exactly)", async () => {
    const out = JSON.parse(cli(...names.map(f), "--pool", "--plan", f("plan.json"), "--json").out);
    const stacked = names.flatMap((n) => fs.readFileSync(f(n), "utf8").trim().split("\n").slice(1));
    const one = await checkBatch(chunks([HEADER.join(","), ...stacked].join("\n") + "\n"), planOf());
    expect(out.pool.rows).toEqual({ total: 450, complete: 450 });
    expect(Math.abs(out.pool.fit.F - one.fit!.F!) / one.fit!.F!).toBeLessThan(1e-10);
  });

  test("the readable summary names each file and the pool's answers; an unreadable file → 2, no pool", () => {
    const r = cli(...names.map(f), "--pool", "--plan", f("plan.json"));
    expect(r.code, r.err).toBe(0);
    expect(r.out).toMatch(
      /north\.csv: 150 rows[\s\S]*Readiness report for the pool of 3 files[\s\S]*poolability:[\s\S]*influence:/,
    );
    const bad = cli(f("north.csv"), f("book.csv"), "--pool", "--plan", f("plan.json"), "--json");
    expect(bad.code).toBe(2);
    const out = JSON.parse(bad.out);
    expect(out.pool).toBeNull();
    expect(out.message).toMatch(/book\.csv cannot be read/);
  });
});
