// The README's HTTP walk-through runs as typed: every `sh` block of its "The HTTP API" section, in
// order and unchanged but for the address (the test server's instead of `npm start`'s), runs in one
// bash from a folder that sees the repository's `db/demo/` files, and leaves the reports it promises.
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";

const BASE = (process.env.EMBERLINE_TEST_URL ?? "http://127.0.0.1:3100").replace(/\/$/, "");
const ROOT = path.resolve(__dirname, "../..");
const README_ADDRESS = "http://127.0.0.1:3000";

/** The `sh` blocks between a level-2 heading and the next one. */
function shellBlocksOfSection(markdown: string, heading: string): string[] {
  const start = markdown.indexOf(`\n## ${heading}\n`);
  if (start < 0) throw new Error(`The README has no section "${heading}".`);
  const end = markdown.indexOf("\n## ", start + 1);
  const section = markdown.slice(start, end < 0 ? undefined : end);
  return [...section.matchAll(/```sh\n([\s\S]*?)```/g)].map((m) => m[1]);
}

const workDir = fs.mkdtempSync(path.join(os.tmpdir(), "emberline-readme-"));
afterAll(() => fs.rmSync(workDir, { recursive: true, force: true }));

describe("the README's curl walk-through", () => {
  it("runs as typed and leaves the run's reports and the notebook's calls", () => {
    const blocks = shellBlocksOfSection(
      fs.readFileSync(path.join(ROOT, "README.md"), "utf8"),
      "The HTTP API",
    );
    // Sign-in and token, the lamp-to-calls walk-through, the reports, the line library.
    expect(blocks.length).toBeGreaterThanOrEqual(4);
    const script = blocks.join("\n").replaceAll(README_ADDRESS, BASE);
    // Nothing left for the reader to fill in.
    expect(script).not.toContain("…");
    fs.symlinkSync(path.join(ROOT, "db"), path.join(workDir, "db"));
    const output = execFileSync("bash", ["-euo", "pipefail", "-c", script], {
      cwd: workDir,
      encoding: "utf8",
      timeout: 150_000,
    });
    // The demo flame holds K, Li, Sr and Ca: the invented demo file's own truth.
    // curl prints replies without a newline: a reply's closing brace also ends a "line" here.
    const presentLine = output
      .split(/\n|(?<=\})/)
      .find((line) => /^[A-Z][a-z]? I(, |$)/.test(line));
    expect(presentLine, output).toBeDefined();
    for (const species of ["K I", "Li I", "Sr I", "Ca I"]) expect(presentLine).toContain(species);
    const file = (name: string) => fs.readFileSync(path.join(workDir, name));
    expect(file("run.pdf").subarray(0, 5).toString("latin1")).toBe("%PDF-");
    expect(file("peaks.csv").toString("utf8")).toMatch(
      /^# Emberline peaks and candidate lines of run /,
    );
    expect(file("run.jdx").toString("latin1")).toMatch(/^##TITLE=/);
    expect(file("even.jdx").toString("latin1")).toContain("##XYDATA=(X++(Y..Y))");
    expect(file("calls.csv").toString("utf8")).toMatch(/^# /);
    // The line library's sodium D lines.
    expect(output).toContain("589.");
    // About 20 s alone; several times that on a machine busy with other test runs.
  }, 180_000);
});
