"use client";
/** The subsets each criterion chooses, and the forward and backward paths step by step. */
import { DataTable, type Column } from "@/components/data-table";
import type { SelectionPath, SelectionPreview } from "@/lib/readiness";
import { statColumn, termsColumn } from "./question-columns";

const CRITERION: Record<SelectionPreview["picks"][number]["criterion"], string> = {
  adjR2: "Adjusted R²",
  cp: "Mallows' Cp",
  aic: "AIC",
  bic: "BIC",
  lobo: "Leave-one-batch-out prediction error",
};

type PickRow = SelectionPreview["picks"][number] & { id: string };

const pickColumns: Column<PickRow>[] = [
  {
    key: "criterion",
    header: "Criterion",
    value: (r) => CRITERION[r.criterion],
    width: "minmax(12rem, 1.5fr)",
  },
  { key: "size", header: "Size", value: (r) => r.size, numeric: true, width: "5rem" },
  termsColumn("terms", "Terms chosen", (r) => r.terms, "minmax(16rem, 3fr)"),
];

export function ChosenSubsets({ selection, csvName }: { selection: SelectionPreview; csvName: string }) {
  return (
    <DataTable
      rows={selection.picks.map((p) => ({ ...p, id: p.criterion }))}
      columns={pickColumns}
      caption="Subsets chosen by each criterion"
      csvName={csvName}
    />
  );
}

type StepRow = SelectionPath["steps"][number] & {
  id: string;
  direction: string;
  criterion: string;
  stops: boolean;
  step: number;
};

const stepColumns: Column<StepRow>[] = [
  {
    key: "path",
    header: "Path",
    value: (r) => `${r.direction}, ${r.criterion.toUpperCase()}`,
    width: "9rem",
  },
  { key: "step", header: "Step", value: (r) => r.step, numeric: true, width: "4.5rem" },
  {
    key: "change",
    header: "Change",
    value: (r) => r.change ?? "start",
    render: (r) => <span className="font-mono text-xs">{r.change ?? "start"}</span>,
    width: "minmax(9rem, 1.5fr)",
  },
  termsColumn("terms", "Terms in the model", (r) => r.terms),
  statColumn("aic", "AIC", (r) => r.aic, "6.5rem"),
  statColumn("bic", "BIC", (r) => r.bic, "6.5rem"),
  { key: "stop", header: "Stops here", value: (r) => (r.stops ? "yes" : ""), width: "6.5rem" },
];

export function SelectionPaths({ selection, csvName }: { selection: SelectionPreview; csvName: string }) {
  const rows: StepRow[] = [];
  for (const [direction, paths] of [
    ["forward", selection.forward],
    ["backward", selection.backward],
  ] as const) {
    for (const path of [paths.aic, paths.bic]) {
      path.steps.forEach((s, i) =>
        rows.push({
          ...s,
          id: `${direction}-${path.criterion}-${i}`,
          direction,
          criterion: path.criterion,
          step: i,
          stops: i === path.stop,
        }),
      );
    }
  }
  return (
    <DataTable rows={rows} columns={stepColumns} caption="Forward and backward paths" csvName={csvName} />
  );
}
