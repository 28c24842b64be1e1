"use client";
/**
 * The provider's upload: choose the study (or send a new version of a batch), choose a
 * file, see the engine's findings from the browser at once, then upload with progress.
 */
import { useEffect, useMemo, useRef, useState } from "react";
import { useRouter } from "next/navigation";
import { toast } from "sonner";
import { generateReactHelpers } from "@uploadthing/react";
import type { BatchFileRouter } from "@/lib/batches/intake/file-router";
import { Button, Field, Input, Select } from "@/components/ui";
import { SeverityBadge, SeverityShape } from "@/components/severity-badge";
import { batchFileProblem } from "@/lib/batches/intake/file-rules";
import { beforeUploadList } from "@/lib/batches/intake/precheck-list";
import { countOf, formatBytes } from "@/lib/format";
import { usePrecheck } from "@/lib/client/use-precheck";
import { useHydrated } from "@/lib/client/use-hydrated";
import { uploadErrorMessage } from "@/lib/batches/intake/upload-errors";

const { useUploadThing } = generateReactHelpers<BatchFileRouter>();

export type UploadStudy = { slug: string; title: string; plan: unknown };

const ACCEPT = ".csv,.tsv,.txt,text/csv,text/tab-separated-values,text/plain";

export function UploadPanel({
  studies,
  maxUploadMb,
  batch,
}: {
  studies: UploadStudy[];
  maxUploadMb: number;
  /** set when sending a new version of an existing batch */
  batch?: { publicId: string; title: string; studySlug: string };
}) {
  const router = useRouter();
  const [studySlug, setStudySlug] = useState(batch?.studySlug ?? studies[0]?.slug ?? "");
  const [label, setLabel] = useState("");
  const [file, setFile] = useState<File | null>(null);
  const [fileError, setFileError] = useState<string | null>(null);
  const [progress, setProgress] = useState<number | null>(null);
  const input = useRef<HTMLInputElement>(null);
  const precheck = usePrecheck();
  const hydrated = useHydrated();
  const study = useMemo(() => studies.find((s) => s.slug === studySlug), [studies, studySlug]);

  const { startUpload, isUploading } = useUploadThing("batchFile", {
    onUploadProgress: (p) => setProgress(p),
    onUploadError: (e) => {
      setProgress(null);
      toast.error(uploadErrorMessage(e));
    },
  });

  function choose(f: File | null) {
    setFileError(null);
    precheck.reset();
    setFile(null);
    if (!f) return;
    const problem = batchFileProblem(f, maxUploadMb);
    if (problem) return setFileError(problem);
    setFile(f);
    if (study) precheck.run(f, study.plan);
  }

  // A file chosen before the page's script ran (a slow connection, or a test driving the input)
  // fired its change event with no handler yet: take it up once the page is live, so it is not lost.
  const chooseOnMount = useRef(choose);
  useEffect(() => {
    const early = input.current?.files?.[0];
    if (early) chooseOnMount.current(early);
  }, []);

  async function upload() {
    if (!file || !study) return;
    setProgress(0);
    const res = await startUpload([file], {
      studySlug: study.slug,
      ...(batch ? { batchId: batch.publicId } : {}),
      ...(label.trim() ? { label: label.trim() } : {}),
    });
    const data = res?.[0]?.serverData as { batchId?: string; version?: number } | undefined;
    if (data?.batchId) {
      toast.success(`Received as version ${data.version ?? 1}. The checks are running.`);
      router.push(`/batches/${data.batchId}`);
    } else {
      setProgress(null);
    }
  }

  const s = precheck.state;
  const serious = s.phase === "done" ? beforeUploadList(s.report.findings) : { listed: [], more: 0 };
  const pct =
    s.phase === "running" && s.total > 0 ? Math.min(100, Math.round((s.bytes / s.total) * 100)) : null;

  return (
    <div className="grid grid-cols-1 gap-5">
      {batch ? (
        <p className="text-sm text-ink">
          New version of <strong>{batch.title}</strong>. The previous version will be marked superseded.
        </p>
      ) : (
        <div className="grid grid-cols-1 gap-4 sm:grid-cols-2">
          <Field id="study" label="Study">
            <Select
              id="study"
              value={studySlug}
              onChange={(e) => {
                setStudySlug(e.target.value);
                if (file) {
                  const st = studies.find((x) => x.slug === e.target.value);
                  if (st) precheck.run(file, st.plan);
                }
              }}
            >
              {studies.map((st) => (
                <option key={st.slug} value={st.slug}>
                  {st.title}
                </option>
              ))}
            </Select>
          </Field>
          <Field id="label" label="Batch name (optional)" hint="Defaults to the file name.">
            <Input id="label" value={label} maxLength={200} onChange={(e) => setLabel(e.target.value)} />
          </Field>
        </div>
      )}

      <div
        className="rounded border-2 border-dashed border-silt/60 bg-white px-6 py-8 text-center"
        onDragOver={(e) => e.preventDefault()}
        onDrop={(e) => {
          e.preventDefault();
          choose(e.dataTransfer.files?.[0] ?? null);
        }}
      >
        <p className="mb-3 text-ink">Drop the batch file here, or</p>
        <Button variant="secondary" onClick={() => input.current?.click()}>
          Choose a file
        </Button>
        <input
          ref={input}
          type="file"
          accept={ACCEPT}
          className="sr-only"
          aria-label="Batch file"
          data-testid="batch-file-input"
          data-ready={hydrated ? "true" : undefined}
          onChange={(e) => choose(e.target.files?.[0] ?? null)}
        />
        <p className="mt-3 text-sm text-silt-ink">CSV or TSV, UTF-8, up to {maxUploadMb} MB.</p>
        {file ? (
          <p className="mt-2 font-mono text-sm">
            {file.name} · {formatBytes(file.size)}
          </p>
        ) : null}
      </div>
      <p aria-live="polite" className="text-sm text-clay" role={fileError ? "alert" : undefined}>
        {fileError}
      </p>

      <section aria-live="polite" aria-label="Check before upload" data-testid="precheck">
        {s.phase === "running" ? (
          <p className="tabular-nums text-sm">
            Checking in your browser… {countOf(s.rows, "row")} read{pct !== null ? ` (${pct} %)` : ""}
          </p>
        ) : null}
        {s.phase === "error" ? <p className="text-sm text-silt-ink">{s.message}</p> : null}
        {s.phase === "done" ? (
          <div className="grid grid-cols-1 gap-2">
            <div className="flex flex-wrap items-center gap-3 text-sm">
              <span className="font-semibold">Before upload:</span>
              <SeverityBadge severity="blocker" count={s.report.counts.blocker} />
              <SeverityBadge severity="warning" count={s.report.counts.warning} />
              <SeverityBadge severity="note" count={s.report.counts.note} />
              <span className="tabular-nums text-silt-ink">
                {countOf(s.report.rows.total, "row")}, {countOf(s.report.rows.complete, "complete case")}
              </span>
            </div>
            {serious.listed.length > 0 ? (
              <ul className="grid grid-cols-1 gap-1 text-sm">
                {serious.listed.map((f, i) => (
                  <li key={`${f.code}-${i}`} className="flex gap-2">
                    <SeverityShape severity={f.severity} className="mt-1 shrink-0" />
                    <span>
                      <code className="text-xs text-silt-ink">{f.code}</code> {f.message}{" "}
                      <span className="text-silt-ink">— {f.fix}</span>
                    </span>
                  </li>
                ))}
                {serious.more > 0 ? (
                  <li className="text-silt-ink">
                    and {countOf(serious.more, "more blocker or warning", "more blockers or warnings")}: the
                    report after upload lists every one.
                  </li>
                ) : null}
              </ul>
            ) : (
              <p className="text-sm text-reed">No blockers or warnings found in the browser.</p>
            )}
            <p className="text-xs text-silt-ink">
              You can fix the file and choose it again, or upload it as it is: the server checks it again
              either way.
            </p>
          </div>
        ) : null}
      </section>

      <div className="flex items-center gap-4">
        <Button
          onClick={upload}
          disabled={!file || !study || isUploading}
          busy={isUploading}
          data-testid="upload-button"
        >
          {batch ? "Upload new version" : "Upload batch"}
        </Button>
        {progress !== null ? (
          <div className="flex items-center gap-2 text-sm tabular-nums" aria-live="polite">
            <progress max={100} value={progress} className="h-2 w-40" aria-label="Upload progress" />
            <span>Uploading… {progress} %</span>
          </div>
        ) : null}
      </div>
    </div>
  );
}
