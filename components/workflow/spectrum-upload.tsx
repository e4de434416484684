"use client";
// Uploads a lamp or sample file: drop it on the zone or choose it with the button (keyboard
// reachable), then send it as multipart to POST /api/spectra with the upload's progress shown. The
// API stores on upload (there is no separate commit step), so success opens the page's "Uploaded"
// state with the preview of the parsed points; a refused file shows the API's located message.
import { useRouter } from "next/navigation";
import { useCallback, useState } from "react";
import { useDropzone, type FileRejection } from "react-dropzone";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/form-message";

type Phase = { step: "idle" } | { step: "sending"; percent: number } | { step: "failed"; message: string; detail?: string[] };

function describeRejection(rejection: FileRejection, maxBytes: number): string {
  const tooLarge = rejection.errors.some((e) => e.code === "file-too-large");
  if (tooLarge) return `${rejection.file.name} is ${rejection.file.size} bytes; files of up to ${maxBytes} bytes are accepted.`;
  return rejection.errors.map((e) => e.message).join(" ");
}

export function SpectrumUpload({
  instrumentId,
  defaultKind,
  maxBytes,
  afterUploadHref,
}: {
  instrumentId: string;
  defaultKind: "lamp" | "sample";
  maxBytes: number;
  /** Where to go once stored; `{id}` is replaced by the new spectrum's id. */
  afterUploadHref: string;
}) {
  const router = useRouter();
  const [file, setFile] = useState<File | null>(null);
  const [kind, setKind] = useState(defaultKind);
  const [label, setLabel] = useState("");
  const [phase, setPhase] = useState<Phase>({ step: "idle" });

  const onDrop = useCallback(
    (accepted: File[], rejected: FileRejection[]) => {
      if (rejected.length > 0) {
        setFile(null);
        setPhase({ step: "failed", message: describeRejection(rejected[0], maxBytes) });
        return;
      }
      setFile(accepted[0] ?? null);
      setPhase({ step: "idle" });
    },
    [maxBytes],
  );
  // The zone itself is not a tab stop: the "Choose a file" button is the keyboard's way in.
  const { getRootProps, getInputProps, isDragActive, open } = useDropzone({
    onDrop,
    multiple: false,
    maxSize: maxBytes,
    noClick: true,
    noKeyboard: true,
  });

  function send() {
    if (!file) return;
    const form = new FormData();
    form.set("file", file);
    form.set("instrumentId", instrumentId);
    form.set("kind", kind);
    form.set("label", label);
    const request = new XMLHttpRequest();
    request.open("POST", "/api/spectra");
    request.responseType = "json";
    request.upload.onprogress = (event) => {
      if (event.lengthComputable) setPhase({ step: "sending", percent: Math.round((100 * event.loaded) / event.total) });
    };
    request.onload = () => {
      const body = request.response as { id?: string; error?: { message: string; fieldErrors?: Record<string, string[]> } } | null;
      if (request.status === 201 && body?.id) {
        router.push(afterUploadHref.replace("{id}", body.id).replace("{kind}", kind));
        return;
      }
      const message = body?.error?.message ?? `The upload failed (HTTP ${request.status}). Nothing was stored.`;
      const detail = Object.values(body?.error?.fieldErrors ?? {}).flat().filter((m) => m !== message);
      setPhase({ step: "failed", message: `${message} Nothing was stored.`, detail });
    };
    request.onerror = () => setPhase({ step: "failed", message: "The connection failed during the upload. Nothing was stored." });
    setPhase({ step: "sending", percent: 0 });
    request.send(form);
  }

  const sending = phase.step === "sending";
  return (
    <div className="flex max-w-2xl flex-col gap-4">
      <fieldset className="flex flex-wrap gap-4 text-sm">
        <legend className="mb-1 text-sm font-medium">Kind of spectrum</legend>
        {(["lamp", "sample"] as const).map((value) => (
          <label key={value} className="flex items-center gap-1.5">
            <input type="radio" name="kind" value={value} checked={kind === value} onChange={() => setKind(value)} />
            {value === "lamp" ? "Reference lamp (for a calibration)" : "Sample (for an identification run)"}
          </label>
        ))}
      </fieldset>
      <div className="flex flex-col gap-1">
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
      <div
        {...getRootProps({
          "aria-label": "Drop zone for a spectrum file",
          "data-testid": "dropzone",
        } as React.HTMLAttributes<HTMLDivElement>)}
        className={`flex flex-col items-center gap-2 rounded border-2 border-dashed p-8 text-center text-sm ${
          isDragActive ? "border-ember-600 bg-ember-50 dark:bg-ink-800" : "border-[var(--line)]"
        }`}
      >
        <input {...getInputProps()} aria-label="Spectrum file" />
        <p>{isDragActive ? "Drop the file to select it" : "Drag a spectrum file here, or"}</p>
        <Button type="button" variant="quiet" onClick={open}>
          Choose a file…
        </Button>
        <p className="muted text-xs" data-testid="chosen-file" aria-live="polite">
          {file ? `Selected: ${file.name} (${file.size.toLocaleString("en")} bytes)` : "No file selected."}
        </p>
      </div>
      <div className="flex items-center gap-3">
        <Button type="button" onClick={send} disabled={!file} pending={sending}>
          {sending ? "Uploading…" : "Upload"}
        </Button>
        {sending ? (
          <div className="flex items-center gap-2 text-sm">
            <progress max={100} value={phase.percent} aria-label="Upload progress" className="w-48" />
            <span>{phase.percent}% sent</span>
          </div>
        ) : null}
      </div>
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
