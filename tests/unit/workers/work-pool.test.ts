// The worker pool: tasks run on a thread and come back; a full queue refuses at once with 503 and
// Retry-After (not a longer wait); errors thrown on the thread come back as the classes services catch.
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { AppError, toResponse } from "@/lib/errors";
import { analyzeSample } from "@/lib/spectrum/analysis";
import { CalibrationError } from "@/lib/spectrum/calibration";
import { synthesizeSpectrum } from "@/lib/spectrum/synthetic";
import type { ReferenceLine } from "@/lib/spectrum/types";
import { reviveTaskError, runHeavyTask } from "@/lib/workers/heavy-pool";
import { createWorkPool } from "@/lib/workers/work-pool";
import { realisticLamp } from "../../support/realistic-lamp";

const filename = path.resolve("lib/workers/heavy-worker.mjs");
// One thread and room for one waiting task: a third task at once finds the queue full.
const pool = createWorkPool({ filename, threads: 1, maxQueue: 1, retryAfterSeconds: 7 });

afterAll(() => pool.close());

// A thread starts by compiling the tasks with tsx (seconds on a busy machine): generous limits.
describe("createWorkPool", { timeout: 120_000 }, () => {
  it("runs a task on a thread and returns its plain result", async () => {
    await expect(runHeavyTask({ kind: "sleep", ms: 5 }, pool)).resolves.toEqual({ sleptMs: 5 });
  });

  it("refuses with 503 and Retry-After when the queue is full, and runs what it accepted", async () => {
    // The thread is up first (a thread still starting would hold tasks in the queue too).
    await runHeavyTask({ kind: "sleep", ms: 1 }, pool);
    const settled = await Promise.allSettled(
      [0, 1, 2, 3].map(() => runHeavyTask({ kind: "sleep", ms: 400 }, pool)),
    );
    const fulfilled = settled.filter((s) => s.status === "fulfilled");
    const refused = settled.flatMap((s) => (s.status === "rejected" ? [s.reason as unknown] : []));
    // One running, one waiting; the other two refused.
    expect(fulfilled).toHaveLength(2);
    expect(refused).toHaveLength(2);
    for (const error of refused) {
      expect(error).toBeInstanceOf(AppError);
      expect((error as AppError).code).toBe("unavailable");
      expect((error as AppError).status).toBe(503);
      const response = toResponse(error);
      expect(response.status).toBe(503);
      expect(response.headers.get("Retry-After")).toBe("7");
      const body = (await response.json()) as { error: { message: string } };
      expect(body.error.message).toMatch(/busy/);
    }
    // The refusal was not permanent: once the queue drains, the pool takes work again.
    await expect(runHeavyTask({ kind: "sleep", ms: 1 }, pool)).resolves.toEqual({ sleptMs: 1 });
  });

  it("brings back an error thrown on the thread as the class the service catches", async () => {
    // A lamp calibration with mismatched arrays is refused inside the core, on the thread, with a
    // CalibrationError("invalid-input") that the calibration service maps to a 4xx.
    const task = {
      kind: "edit-lamp-calibration" as const,
      x: Float64Array.of(0, 1, 2),
      y: Float64Array.of(1, 2),
      lines: [],
      options: {
        nominalRangeNm: [400, 700] as [number, number],
        dispersion: "grating" as const,
        domain: [0, 2] as [number, number],
      },
      edits: {},
    };
    const error = await runHeavyTask(task, pool).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(CalibrationError);
    expect((error as CalibrationError).code).toBe("invalid-input");
  });

  it("keeps a bad hand edit's field across the thread, so the reply can point at it", async () => {
    const lamp = realisticLamp(7, {
      clean: true,
      dispersion: "grating-straight",
      gases: ["Hg", "Ar"],
      pixels: 2048,
    });
    const task = {
      kind: "edit-lamp-calibration" as const,
      x: lamp.x,
      y: lamp.y,
      lines: lamp.lines,
      options: {
        nominalRangeNm: lamp.statedRangeNm,
        dispersion: "grating" as const,
        resolutionNm: lamp.resolutionNm,
        domain: [0, 2047] as [number, number],
      },
      // No lamp line of the table sits at 123.456 nm.
      edits: { added: [{ pixel: 1000, wavelengthNm: 123.456 }] },
    };
    const error = await runHeavyTask(task, pool).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(CalibrationError);
    const revived = error as CalibrationError;
    // Either the pixel has no peak or the wavelength no line: both are fields of the first added pair.
    expect(revived.code).toBe("invalid-edit");
    expect(String(revived.details.field)).toMatch(/^added\.0\.(pixel|wavelengthNm)$/);
    expect(typeof revived.details.fieldMessage).toBe("string");
  });
});

describe("the analyze-sample task", { timeout: 120_000 }, () => {
  const LINES_NM = [420, 465, 510, 630, 680];
  const table: ReferenceLine[] = LINES_NM.map((nm, i) => ({
    id: `a${i}`,
    species: "A I",
    element: "A",
    ionStage: 1,
    airNm: nm,
    vacuumNm: nm * 1.00028,
    uncertaintyNm: 0.001,
    intensities: { flame: 100 },
    flags: {},
  }));
  const sample = synthesizeSpectrum({
    pixelCount: 2048,
    wavelengthOfPixel: (px) => 400 + (300 * px) / 2047,
    resolutionNm: 0.6,
    lines: LINES_NM.map((wavelengthNm) => ({ wavelengthNm, amplitude: 2000 })),
    readNoiseCounts: 5,
    darkCounts: 100,
    seed: 5,
  });
  const x = Float64Array.from(sample.y, (_, px) => 400 + (300 * px) / 2047);

  it("asks for the lines once per release, then answers what analyzeSample answers on the request thread", async () => {
    const task = {
      kind: "analyze-sample" as const,
      x,
      y: sample.y,
      releaseId: "release-a",
      options: { resolutionNm: 0.6 },
    };
    // One thread: the second call lands where the first built its index.
    await expect(runHeavyTask({ ...task, lines: null }, pool)).resolves.toBeNull();
    const first = await runHeavyTask({ ...task, lines: table }, pool);
    const again = await runHeavyTask({ ...task, lines: null }, pool);
    const direct = analyzeSample(x, sample.y, table, { resolutionNm: 0.6 });
    expect(first!.identification.calls).toEqual(direct.identification.calls);
    expect(again!.identification.calls).toEqual(direct.identification.calls);
    expect(again!.peaks.map((p) => p.wavelengthNm)).toEqual(
      direct.peaks.map((p) => p.wavelengthNm),
    );
    expect(direct.peaks.length).toBeGreaterThanOrEqual(LINES_NM.length);
  });
});

describe("reviveTaskError", () => {
  it("keeps a calibration error's class, code and details", () => {
    const revived = reviveTaskError({
      name: "CalibrationError",
      message: "too few",
      code: "too-few-pairs",
      details: { needed: 3 },
    });
    expect(revived).toBeInstanceOf(CalibrationError);
    expect((revived as CalibrationError).code).toBe("too-few-pairs");
    expect((revived as CalibrationError).details).toEqual({ needed: 3 });
  });

  it("keeps RangeError and the name of anything else", () => {
    expect(reviveTaskError({ name: "RangeError", message: "x" })).toBeInstanceOf(RangeError);
    const other = reviveTaskError({ name: "SpectrumParseError", message: "y" });
    expect(other.name).toBe("SpectrumParseError");
    expect(other.message).toBe("y");
  });
});
