"use client";
// Uploads a lamp or sample file in two steps. Dropping a file on the zone or choosing it with the
// button (keyboard reachable) sends it to POST /api/spectra/preview with the progress shown; the
// server parses and checks it exactly as it would to store it, but stores nothing. The preview shows
// the plot, the facts (points, ranges, unit, SHA-256) and a duplicate warning, with "Store this
// spectrum" (sends the same File to POST /api/spectra, then opens the page's "Uploaded" state) and
// "Choose another file" (back to the zone, nothing stored). A refused file shows the API's located
// message. Kind and label keep their values throughout. When nothing tells what the file's first
// column holds (no header, no export profile, not one row per pixel), the API refuses on `xUnit` and
// the component asks with a select, then checks the file again with the answer; storing sends the same
// answer, which becomes the instrument's export profile when it has none. The preview says how the
// first column was read and offers to read it differently unless the file's header said.
import { useRouter } from "next/navigation";
import { useCallback, useEffect, useRef, useState } from "react";
import { useDropzone, type FileRejection } from "react-dropzone";
import { PreviewChart } from "@/components/charts/spectrum-charts";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/form-message";
import type { ExportProfileFields, SpectrumPreview, StoredUpload } from "@/lib/services/spectra";
import type { AxisUnit, FirstColumnKind, WavelengthMedium } from "@/lib/spectrum/types";
import { FirstColumnFields } from "./first-column-fields";
import { FIRST_COLUMN_FROM_LABELS, describeFirstColumn } from "./first-column-labels";
import { isWavelengthUnit } from "@/lib/spectrum/types";

/** What the chemist said the first column holds (sent as xUnit and medium), or null: not said. */
type Statement = { xUnit: FirstColumnKind; medium: WavelengthMedium | null } | null;

type Phase =
  | { step: "idle" }
  | { step: "checking"; file: File; percent: number; statement: Statement }
  | { step: "preview"; file: File; preview: SpectrumPreview; statement: Statement }
  | {
      step: "storing";
      file: File;
      preview: SpectrumPreview;
      statement: Statement;
      percent: number;
    }
  /** The first column needs saying: `reason` is why (null when the chemist asked to change it). */
  | { step: "asking"; file: File; reason: string | null }
  | { step: "failed"; file: File | null; message: string; detail?: string[] };

interface ErrorReply {
  error?: { message: string; fieldErrors?: Record<string, string[]> };
}

function describeRejection(rejection: FileRejection, maxBytes: number): string {
  const tooLarge = rejection.errors.some((e) => e.code === "file-too-large");
  if (tooLarge)
    return `${rejection.file.name} is ${rejection.file.size} bytes; files of up to ${maxBytes} bytes are accepted.`;
  return rejection.errors.map((e) => e.message).join(" ");
}

/** The API's message and any field messages that say more, for a failed request. */
function failure(status: number, body: ErrorReply | null): { message: string; detail: string[] } {
  const message = body?.error?.message ?? `The request failed (HTTP ${status}).`;
  const detail = Object.values(body?.error?.fieldErrors ?? {})
    .flat()
    .filter((m) => m !== message);
  return { message, detail };
}

/** A message as a sentence, so "Nothing was stored." can follow it. */
const sentence = (message: string) => (/[.!?]$/.test(message) ? message : `${message}.`);

/** A check or store that failed: the server's reason (or the lost connection's), and that nothing was stored. */
function failedPhase(file: File, status: number, body: unknown, connectionLost: string): Phase {
  const { message, detail } =
    status === 0 ? { message: connectionLost, detail: [] } : failure(status, body as ErrorReply);
  return { step: "failed", file, message: `${sentence(message)} Nothing was stored.`, detail };
}

const number = (value: number) => value.toLocaleString("en", { maximumSignificantDigits: 8 });

/** The field message that says why the first column needs saying, when the refusal is about it. */
function firstColumnReason(body: ErrorReply | null): string | null {
  const fields = body?.error?.fieldErrors;
  return fields?.xUnit?.[0] ?? fields?.medium?.[0] ?? null;
}

export function SpectrumUpload({
  instrumentId,
  instrumentName,
  pixels,
  exportProfile,
  defaultKind,
  maxBytes,
  afterUploadHref,
  xTitles,
}: {
  instrumentId: string;
  instrumentName: string;
  /** The detector's pixel count, for the question's explanation. */
  pixels: number;
  /** The instrument's export profile, or null while it has none. */
  exportProfile: ExportProfileFields | null;
  defaultKind: "lamp" | "sample";
  maxBytes: number;
  /** Where to go once stored; `{id}` is replaced by the new spectrum's id, `{kind}` by its kind. */
  afterUploadHref: string;
  /** The x axis title for each unit. */
  xTitles: Record<AxisUnit, string>;
}) {
  const router = useRouter();
  const [kind, setKind] = useState(defaultKind);
  const [label, setLabel] = useState("");
  const [phase, setPhase] = useState<Phase>({ step: "idle" });
  const [answerUnit, setAnswerUnit] = useState<FirstColumnKind | "">("");
  const [answerMedium, setAnswerMedium] = useState<WavelengthMedium | "">("");
  const [answerError, setAnswerError] = useState<string | null>(null);
  const request = useRef<XMLHttpRequest | null>(null);
  const previewHeading = useRef<HTMLHeadingElement>(null);
  const questionHeading = useRef<HTMLHeadingElement>(null);
  const returnFocus = useRef(false);

  /** Sends the file as multipart to `path` with the progress reported; one request at a time. */
  const send = useCallback(
    (
      path: string,
      file: File,
      statement: Statement,
      onProgress: (percent: number) => void,
      onDone: (status: number, body: unknown) => void,
    ) => {
      request.current?.abort();
      const form = new FormData();
      form.set("file", file);
      form.set("instrumentId", instrumentId);
      form.set("kind", kind);
      form.set("label", label);
      if (statement) {
        form.set("xUnit", statement.xUnit);
        if (statement.medium) form.set("medium", statement.medium);
      }
      const xhr = new XMLHttpRequest();
      request.current = xhr;
      xhr.open("POST", path);
      xhr.responseType = "json";
      xhr.upload.onprogress = (event) => {
        if (event.lengthComputable) onProgress(Math.round((100 * event.loaded) / event.total));
      };
      xhr.onload = () => {
        if (request.current === xhr) request.current = null;
        onDone(xhr.status, xhr.response);
      };
      xhr.onerror = () => {
        if (request.current === xhr) request.current = null;
        onDone(0, null);
      };
      xhr.send(form);
    },
    [instrumentId, kind, label],
  );

  const check = useCallback(
    (file: File, statement: Statement = null) => {
      setPhase({ step: "checking", file, percent: 0, statement });
      send(
        "/api/spectra/preview",
        file,
        statement,
        (percent) =>
          setPhase((p) => (p.step === "checking" && p.file === file ? { ...p, percent } : p)),
        (status, body) => {
          if (status === 200 && body) {
            setPhase({ step: "preview", file, preview: body as SpectrumPreview, statement });
            return;
          }
          const reason = status === 400 ? firstColumnReason(body as ErrorReply) : null;
          if (reason) {
            setPhase({ step: "asking", file, reason });
            return;
          }
          setPhase(
            failedPhase(file, status, body, "The connection failed while the file was checked."),
          );
        },
      );
    },
    [send],
  );

  function store() {
    if (phase.step !== "preview") return;
    const { file, preview, statement } = phase;
    setPhase({ step: "storing", file, preview, statement, percent: 0 });
    send(
      "/api/spectra",
      file,
      statement,
      (percent) => setPhase((p) => (p.step === "storing" ? { ...p, percent } : p)),
      (status, body) => {
        const stored = body as Partial<StoredUpload> | null;
        if (status === 201 && stored?.id) {
          const href = afterUploadHref.replace("{id}", stored.id).replace("{kind}", kind);
          router.push(stored.exportProfileSet ? `${href}&profileSet=1` : href);
          return;
        }
        setPhase(failedPhase(file, status, body, "The connection failed during the upload."));
      },
    );
  }

  function chooseAnother() {
    request.current?.abort();
    request.current = null;
    returnFocus.current = true;
    setAnswerUnit("");
    setAnswerMedium("");
    setPhase({ step: "idle" });
  }

  /** From the preview: say what the first column holds instead of how it was read. */
  function readDifferently() {
    if (phase.step !== "preview") return;
    setAnswerUnit(phase.preview.firstColumn ?? "");
    setAnswerMedium(phase.preview.medium ?? "");
    setPhase({ step: "asking", file: phase.file, reason: null });
  }

  function answer(event: React.FormEvent) {
    event.preventDefault();
    if (phase.step !== "asking") return;
    if (answerUnit === "") {
      setAnswerError("Choose what the first column holds.");
      return;
    }
    setAnswerError(null);
    check(phase.file, {
      xUnit: answerUnit,
      medium: isWavelengthUnit(answerUnit) && answerMedium !== "" ? answerMedium : null,
    });
  }

  useEffect(() => () => request.current?.abort(), []);
  useEffect(() => {
    if (phase.step === "asking") questionHeading.current?.focus();
    if (phase.step === "preview") previewHeading.current?.focus();
    if (phase.step === "idle" && returnFocus.current) {
      returnFocus.current = false;
      document.getElementById("choose-spectrum-file")?.focus();
    }
  }, [phase.step]);

  const onDrop = useCallback(
    (accepted: File[], rejected: FileRejection[]) => {
      if (rejected.length > 0) {
        request.current?.abort();
        setPhase({ step: "failed", file: null, message: describeRejection(rejected[0], maxBytes) });
        return;
      }
      if (accepted[0]) check(accepted[0]);
    },
    [maxBytes, check],
  );
  // The zone itself is not a tab stop: the "Choose a file" button is the keyboard's way in.
  const { getRootProps, getInputProps, isDragActive, open } = useDropzone({
    onDrop,
    multiple: false,
    maxSize: maxBytes,
    noClick: true,
    noKeyboard: true,
  });

  const showingPreview = phase.step === "preview" || phase.step === "storing";
  const file = phase.step === "idle" ? null : phase.file;
  const profileWords = exportProfile
    ? describeFirstColumn(exportProfile.exportXUnit, exportProfile.exportMedium)
    : null;
  return (
    <div className="flex max-w-3xl flex-col gap-4">
      <fieldset className="flex flex-wrap gap-4 text-sm">
        <legend className="mb-1 text-sm font-medium">Kind of spectrum</legend>
        {(["lamp", "sample"] as const).map((value) => (
          <label key={value} className="flex items-center gap-1.5">
            <input
              type="radio"
              name="kind"
              value={value}
              checked={kind === value}
              onChange={() => setKind(value)}
            />
            {value === "lamp"
              ? "Reference lamp (for a calibration)"
              : "Sample (for an identification run)"}
          </label>
        ))}
      </fieldset>
      <div className="flex max-w-2xl flex-col gap-1">
        <label htmlFor="upload-label" className="text-sm font-medium">
          Label (optional)
        </label>
        <input
          id="upload-label"
          value={label}
          maxLength={200}
          onChange={(e) => setLabel(e.target.value)}
          className="rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1.5"
        />
      </div>

      {showingPreview ? (
        <section
          aria-labelledby="upload-preview-heading"
          data-testid="upload-preview"
          className="flex flex-col gap-3"
        >
          <h2
            id="upload-preview-heading"
            ref={previewHeading}
            tabIndex={-1}
            className="text-base font-semibold outline-none"
          >
            Preview of {phase.preview.fileName} — not stored yet
          </h2>
          {phase.preview.duplicateOf ? (
            <p
              role="alert"
              data-testid="duplicate-warning"
              className="rounded border border-ember-600 bg-ember-50 p-2 text-sm text-ember-900 dark:bg-ink-800 dark:text-ember-100"
            >
              <span aria-hidden>⚠ </span>The same file (same SHA-256) was uploaded before as{" "}
              {phase.preview.duplicateOf.fileName} on{" "}
              {phase.preview.duplicateOf.uploadedAt.slice(0, 10)}. Storing it again keeps both
              copies.
            </p>
          ) : null}
          {phase.preview.warnings.map((warning) => (
            <p
              key={warning}
              role="alert"
              data-testid="range-warning"
              className="rounded border border-ember-600 bg-ember-50 p-2 text-sm text-ember-900 dark:bg-ink-800 dark:text-ember-100"
            >
              <span aria-hidden>⚠ </span>
              {warning}
            </p>
          ))}
          {phase.preview.exportProfileProposal ? (
            <p
              role="status"
              data-testid="profile-proposal"
              className="rounded border border-teal-700 bg-[var(--panel)] p-2 text-sm"
            >
              {instrumentName} has no export profile yet. Storing this file also sets it: files
              without a header will then be read with their first column as{" "}
              <strong>
                {describeFirstColumn(
                  phase.preview.exportProfileProposal.exportXUnit,
                  phase.preview.exportProfileProposal.exportMedium,
                )}
              </strong>
              . A lab lead can change it on the instrument&apos;s page.
            </p>
          ) : null}
          <dl
            className="grid grid-cols-[max-content_1fr] gap-x-4 gap-y-1 text-sm"
            data-testid="preview-facts"
          >
            <dt className="muted">First column</dt>
            <dd data-testid="first-column">
              {phase.preview.firstColumn
                ? describeFirstColumn(phase.preview.firstColumn, phase.preview.medium)
                : "Pixel index, as the file numbers it (from 0 or 1 is not known)"}
              , read {FIRST_COLUMN_FROM_LABELS[phase.preview.firstColumnFrom]}
              {phase.preview.firstColumn === "pixel-from-1" ? "; stored counted from 0" : ""}
            </dd>
            <dt className="muted">Points</dt>
            <dd>{phase.preview.points.toLocaleString("en")}</dd>
            <dt className="muted">{xTitles[phase.preview.xUnit]}</dt>
            <dd>
              {number(phase.preview.xRange[0])} to {number(phase.preview.xRange[1])}
              {phase.preview.medium ? ` (${phase.preview.medium})` : ""}
            </dd>
            <dt className="muted">Counts</dt>
            <dd>
              {number(phase.preview.yRange[0])} to {number(phase.preview.yRange[1])}
            </dd>
            <dt className="muted">Size</dt>
            <dd>{phase.preview.byteSize.toLocaleString("en")} bytes, to be kept byte for byte</dd>
            <dt className="muted">SHA-256</dt>
            <dd className="break-all font-mono text-xs">{phase.preview.sha256}</dd>
          </dl>
          <PreviewChart
            spectrum={{ ...phase.preview.series, sourcePoints: phase.preview.points }}
            xTitle={xTitles[phase.preview.xUnit]}
          />
          <div className="flex flex-wrap items-center gap-3">
            <Button type="button" onClick={store} pending={phase.step === "storing"}>
              {phase.step === "storing" ? "Storing…" : "Store this spectrum"}
            </Button>
            <Button type="button" variant="quiet" onClick={chooseAnother}>
              Choose another file
            </Button>
            {phase.preview.firstColumnFrom !== "file" ? (
              <Button
                type="button"
                variant="quiet"
                onClick={readDifferently}
                disabled={phase.step === "storing"}
              >
                Read the first column differently…
              </Button>
            ) : null}
            {phase.step === "storing" ? (
              <div className="flex items-center gap-2 text-sm">
                <progress
                  max={100}
                  value={phase.percent}
                  aria-label="Upload progress"
                  className="w-48"
                />
                <span>{phase.percent}% sent</span>
              </div>
            ) : null}
          </div>
        </section>
      ) : phase.step === "asking" ? (
        <form
          onSubmit={answer}
          aria-labelledby="first-column-question"
          data-testid="first-column-question"
          className="flex max-w-2xl flex-col gap-3 rounded border border-ember-600 p-4"
        >
          <h2
            id="first-column-question"
            ref={questionHeading}
            tabIndex={-1}
            className="text-base font-semibold outline-none"
          >
            What does the first column of {phase.file.name} hold?
          </h2>
          <div id="first-column-why" className="flex flex-col gap-1 text-sm">
            {phase.reason ? <p role="alert">{phase.reason}</p> : null}
            <p className="muted">
              {exportProfile
                ? `Your answer is used for this file only; ${instrumentName}'s export profile (${profileWords}) stays as it is.`
                : phase.reason
                  ? `It has no header that says, ${instrumentName} has no export profile yet, and it does not have one row per detector pixel (${pixels.toLocaleString("en")}). Storing the file with your answer makes the answer ${instrumentName}'s export profile, for later files without a header.`
                  : `Storing the file with your answer makes it ${instrumentName}'s export profile, for later files without a header.`}
            </p>
          </div>
          <FirstColumnFields
            idPrefix="answer"
            unitLabel="First column"
            unit={answerUnit}
            medium={answerMedium}
            onUnitChange={(unit) => {
              setAnswerUnit(unit);
              if (unit !== "") setAnswerError(null);
            }}
            onMediumChange={setAnswerMedium}
            unitErrors={answerError ? [answerError] : undefined}
            hintId="first-column-why"
          />
          <div className="flex flex-wrap items-center gap-3">
            <Button type="submit">Read the file this way</Button>
            <Button type="button" variant="quiet" onClick={chooseAnother}>
              Choose another file
            </Button>
          </div>
        </form>
      ) : (
        <div
          {...getRootProps({
            "aria-label": "Drop zone for a spectrum file",
            "data-testid": "dropzone",
          } as React.HTMLAttributes<HTMLDivElement>)}
          className={`flex max-w-2xl flex-col items-center gap-2 rounded border-2 border-dashed p-8 text-center text-sm ${
            isDragActive ? "border-ember-600 bg-ember-50 dark:bg-ink-800" : "border-[var(--line)]"
          }`}
        >
          <input {...getInputProps()} aria-label="Spectrum file" />
          <p>{isDragActive ? "Drop the file to check it" : "Drag a spectrum file here, or"}</p>
          <Button
            type="button"
            variant="quiet"
            onClick={open}
            id="choose-spectrum-file"
            disabled={phase.step === "checking"}
          >
            Choose a file…
          </Button>
          <p className="muted text-xs" data-testid="chosen-file" aria-live="polite">
            {file
              ? `Selected: ${file.name} (${file.size.toLocaleString("en")} bytes)`
              : "No file selected."}
          </p>
          {phase.step === "checking" ? (
            <div className="flex items-center gap-2 text-sm">
              <progress
                max={100}
                value={phase.percent}
                aria-label="Upload progress"
                className="w-48"
              />
              <span>
                {phase.percent < 100
                  ? `${phase.percent}% sent for the preview`
                  : "Checking the file…"}
              </span>
            </div>
          ) : (
            <p className="muted text-xs">You see a preview before anything is stored.</p>
          )}
        </div>
      )}

      <FormMessage message={phase.step === "failed" ? phase.message : null} />
      {phase.step === "failed" && phase.detail?.length ? (
        <ul className="list-disc pl-5 text-sm text-red-700 dark:text-red-300">
          {phase.detail.map((d) => (
            <li key={d}>{d}</li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}
