"use client";
/**
 * The provider's fixes on the batch page: the mechanical corrections Tributary can make to this
 * version (counts and examples, before → after), ticked to apply; the corrected file downloaded,
 * or uploaded in one step as the next version, checked as usual.
 */
import { useState } from "react";
import { useRouter } from "next/navigation";
import { toast } from "sonner";
import { generateReactHelpers } from "@uploadthing/react";
import type { BatchFileRouter } from "@/lib/batches/intake/file-router";
import { uploadErrorMessage } from "@/lib/batches/intake/upload-errors";
import { Button } from "@/components/ui";
import { Section } from "@/components/ui/section";
import { useFixes } from "@/lib/client/use-fixes";
import type { ConfirmedSentinel, FixProposal, ReadinessReport } from "@/lib/readiness";
import { suspectedSentinels } from "@/lib/client/workers/fix-stream";

const { useUploadThing } = generateReactHelpers<BatchFileRouter>();

/** A value as the provider should see it: quoted, so spaces show, and “(empty)” for nothing. */
const shown = (s: string) => (s === "" ? "(empty)" : `“${s}”`);

function ProposalRow({ p, on, toggle }: { p: FixProposal; on: boolean; toggle: () => void }) {
  return (
    <li
      className="rounded border border-silt-line bg-white px-3 py-2"
      data-testid="fix-proposal"
      data-code={p.code}
    >
      <label className="flex items-start gap-2">
        <input
          type="checkbox"
          checked={on}
          onChange={toggle}
          className="mt-1"
          aria-describedby={`${p.id}-examples`}
        />
        <span>
          <span className="text-base">{p.message}</span>{" "}
          <span className="text-sm tabular-nums text-silt-ink">
            ({p.cells.toLocaleString("en")} cell{p.cells === 1 ? "" : "s"})
          </span>
        </span>
      </label>
      <ul id={`${p.id}-examples`} className="ml-6 mt-1 grid gap-0.5 text-sm">
        {p.examples.map((e, i) => (
          <li key={i} className="font-mono text-xs">
            row {e.row}: {shown(e.before)} → {shown(e.after)}
          </li>
        ))}
      </ul>
    </li>
  );
}

export function FixPanel(props: {
  batchId: string;
  studySlug: string;
  version: number;
  fileName: string;
  plan: unknown;
  report: ReadinessReport;
}) {
  const { batchId, studySlug, version, fileName, plan, report } = props;
  const fixes = useFixes();
  const router = useRouter();
  const [off, setOff] = useState<Set<string>>(new Set());
  const [busy, setBusy] = useState<"download" | "upload" | null>(null);
  const [confirmed, setConfirmed] = useState<ConfirmedSentinel[]>([]);
  const suspected = suspectedSentinels(report);
  const isConfirmed = (x: ConfirmedSentinel) =>
    confirmed.some((c) => c.column === x.column && c.value === x.value);
  async function toggleSentinel(x: ConfirmedSentinel) {
    const next = isConfirmed(x)
      ? confirmed.filter((c) => !(c.column === x.column && c.value === x.value))
      : [...confirmed, x];
    setConfirmed(next);
    await fixes.confirm(next);
  }
  const { startUpload } = useUploadThing("batchFile", {
    onUploadError: (e) => {
      toast.error(uploadErrorMessage(e));
    },
  });
  const s = fixes.state;
  const chosen = s.phase === "ready" ? s.proposals.filter((p) => !off.has(p.id)) : [];
  const corrected = `${fileName.replace(/\.[^.]+$/, "") || "batch"}-corrected.csv`;

  async function make(): Promise<File | null> {
    try {
      const out = await fixes.apply(chosen.map((p) => p.id));
      return new File([out.blob], corrected, { type: "text/csv" });
    } catch (e) {
      toast.error((e as Error).message);
      return null;
    }
  }
  async function download() {
    setBusy("download");
    const file = await make();
    setBusy(null);
    if (!file) return;
    const a = document.createElement("a");
    a.href = URL.createObjectURL(file);
    a.download = corrected;
    a.click();
    setTimeout(() => URL.revokeObjectURL(a.href), 10_000);
  }
  async function upload() {
    setBusy("upload");
    const file = await make();
    const res = file
      ? await startUpload([file], {
          studySlug,
          batchId,
          fixes: {
            fromVersion: version,
            proposals: chosen.map((p) => p.id),
            confirmedSentinels: confirmed.filter((c) =>
              chosen.some((p) => p.id === `number.sentinel:${c.column}`),
            ),
          },
        })
      : null;
    setBusy(null);
    const data = res?.[0]?.serverData as { batchId?: string; version?: number } | undefined;
    if (data?.batchId) {
      toast.success(`Sent as version ${data.version}. The checks are running.`);
      router.push(`/batches/${data.batchId}?v=${data.version}`);
      router.refresh();
    }
  }

  return (
    <Section
      title="Fixes Tributary can make"
      id="fixes"
      note="Only mechanical corrections whose result is certain; anything ambiguous stays a finding for you to settle. Check the corrected file: the fixes support your judgement, they do not replace it. This version stays as it is."
    >
      {s.phase === "idle" || s.phase === "finding" ? (
        <Button
          variant="secondary"
          busy={s.phase === "finding"}
          onClick={() => fixes.find(`/api/v1/batches/${batchId}/versions/${version}/file`, plan, report)}
        >
          Find the fixes for this version
        </Button>
      ) : s.phase === "error" ? (
        <p role="alert" className="text-sm text-clay">
          {s.message}
        </p>
      ) : s.proposals.length === 0 && suspected.length === 0 ? (
        <p className="text-base" data-testid="no-fixes">
          No finding of this version has a mechanical fix; correct the file yourself and upload a new version.
        </p>
      ) : (
        <>
          {suspected.length > 0 && (
            <fieldset className="mb-3 grid gap-1" data-testid="suspected-sentinels">
              <legend className="text-sm text-silt-ink">
                Values the check suspects of meaning “not measured”. Caution: a real measurement that is
                blanked is lost from the analysis — tick one only if you know it is a code.
              </legend>
              {suspected.map((x) => (
                <label key={`${x.column}:${x.value}`} className="flex items-center gap-2 text-base">
                  <input
                    type="checkbox"
                    checked={isConfirmed(x)}
                    onChange={() => toggleSentinel(x)}
                    data-testid="confirm-sentinel"
                  />
                  <span>
                    {x.value} in “{x.column}” means not measured
                  </span>
                </label>
              ))}
            </fieldset>
          )}
          <ul className="grid grid-cols-1 gap-2">
            {s.proposals.map((p) => (
              <ProposalRow
                key={p.id}
                p={p}
                on={!off.has(p.id)}
                toggle={() =>
                  setOff((o) =>
                    o.has(p.id) ? new Set([...o].filter((x) => x !== p.id)) : new Set([...o, p.id]),
                  )
                }
              />
            ))}
          </ul>
          <div className="mt-3 flex flex-wrap gap-2">
            <Button
              variant="secondary"
              disabled={!chosen.length || busy !== null}
              busy={busy === "download"}
              onClick={download}
            >
              Download the corrected file
            </Button>
            <Button disabled={!chosen.length || busy !== null} busy={busy === "upload"} onClick={upload}>
              Apply and send as version {version + 1}
            </Button>
          </div>
        </>
      )}
    </Section>
  );
}
