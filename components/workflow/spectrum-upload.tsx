"use client";
// Uploads a lamp or sample file in two steps. Dropping a file on the zone or choosing it with the
// button (keyboard reachable) sends it to POST /api/spectra/preview with the progress shown; the
// server parses and checks it exactly as it would to store it, but stores nothing. The preview shows
// the plot, the facts (points, ranges, unit, SHA-256) and a duplicate warning, with "Store this
// spectrum" (sends the same File to POST /api/spectra, then opens the page's "Uploaded" state) and
// "Choose another file" (back to the zone, nothing stored). A refused file shows the API's located
// message. Kind and label keep their values throughout.
import { useRouter } from "next/navigation";
import { useCallback, useEffect, useRef, useState } from "react";
import { useDropzone, type FileRejection } from "react-dropzone";
import { PreviewChart } from "@/components/charts/spectrum-charts";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/form-message";
import type { SpectrumPreview } from "@/lib/services/spectra";
import type { AxisUnit } from "@/lib/spectrum/types";

type Phase =
  | { step: "idle" }
  | { step: "checking"; file: File; percent: number }
  | { step: "preview"; file: File; preview: SpectrumPreview }
  | { step: "storing"; file: File; preview: SpectrumPreview; percent: number }
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

const number = (value: number) => value.toLocaleString("en", { maximumSignificantDigits: 8 });

export function SpectrumUpload({
  instrumentId,
  defaultKind,
  maxBytes,
  afterUploadHref,
  xTitles,
}: {
  instrumentId: string;
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
  const request = useRef<XMLHttpRequest | null>(null);
  const previewHeading = useRef<HTMLHeadingElement>(null);
  const returnFocus = useRef(false);

  /** Sends the file as multipart to `path` with the progress reported; one request at a time. */
  const send = useCallback(
    (
      path: string,
      file: File,
      onProgress: (percent: number) => void,
      onDone: (status: number, body: unknown) => void,
    ) => {
      request.current?.abort();
      const form = new FormData();
      form.set("file", file);
      form.set("instrumentId", instrumentId);
      form.set("kind", kind);
      form.set("label", label);
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
    (file: File) => {
      setPhase({ step: "checking", file, percent: 0 });
      send(
        "/api/spectra/preview",
        file,
        (percent) =>
          setPhase((p) => (p.step === "checking" && p.file === file ? { ...p, percent } : p)),
        (status, body) => {
          if (status === 200 && body) {
            setPhase({ step: "preview", file, preview: body as SpectrumPreview });
            return;
          }
          const { message, detail } =
            status === 0
              ? { message: "The connection failed while the file was checked.", detail: [] }
              : failure(status, body as ErrorReply);
          setPhase({
            step: "failed",
            file,
            message: `${sentence(message)} Nothing was stored.`,
            detail,
          });
        },
      );
    },
    [send],
  );

  function store() {
    if (phase.step !== "preview") return;
    const { file, preview } = phase;
    setPhase({ step: "storing", file, preview, percent: 0 });
    send(
      "/api/spectra",
      file,
      (percent) => setPhase((p) => (p.step === "storing" ? { ...p, percent } : p)),
      (status, body) => {
        const stored = body as { id?: string } | null;
        if (status === 201 && stored?.id) {
          router.push(afterUploadHref.replace("{id}", stored.id).replace("{kind}", kind));
          return;
        }
        const { message, detail } =
          status === 0
            ? { message: "The connection failed during the upload.", detail: [] }
            : failure(status, body as ErrorReply);
        setPhase({
          step: "failed",
          file,
          message: `${sentence(message)} Nothing was stored.`,
          detail,
        });
      },
    );
  }

  function chooseAnother() {
    request.current?.abort();
    request.current = null;
    returnFocus.current = true;
    setPhase({ step: "idle" });
  }

  useEffect(() => () => request.current?.abort(), []);
  useEffect(() => {
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
          <dl
            className="grid grid-cols-[max-content_1fr] gap-x-4 gap-y-1 text-sm"
            data-testid="preview-facts"
          >
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
          <PreviewChart spectrum={phase.preview.series} xTitle={xTitles[phase.preview.xUnit]} />
          {phase.preview.series.x.length < phase.preview.points ? (
            <p className="muted text-xs">
              The plot shows {phase.preview.series.x.length.toLocaleString("en")} of the points
              (each stretch&apos;s lowest and highest); all{" "}
              {phase.preview.points.toLocaleString("en")} are stored.
            </p>
          ) : null}
          <div className="flex flex-wrap items-center gap-3">
            <Button type="button" onClick={store} pending={phase.step === "storing"}>
              {phase.step === "storing" ? "Storing…" : "Store this spectrum"}
            </Button>
            <Button type="button" variant="quiet" onClick={chooseAnother}>
              Choose another file
            </Button>
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
