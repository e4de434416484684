// The README's curl example (docs/api-example.sh) runs against the served app: a lamp file and a
// sample file go in, element calls come out.
import { execFileSync } from "node:child_process";
import path from "node:path";
import { describe, expect, it } from "vitest";

const BASE = process.env.EMBERLINE_TEST_URL ?? "http://127.0.0.1:3100";

describe("the README's API example", () => {
  it("takes the demo lamp and flame files to calibrated element calls", () => {
    const output = execFileSync(
      "bash",
      [path.resolve(__dirname, "../../docs/api-example.sh"), BASE],
      {
        encoding: "utf8",
        timeout: 60_000,
      },
    );
    expect(output).toMatch(/^calibration: \S+ polynomial\S* RMS 0\.0\d{3} nm$/m);
    // The demo flame holds K, Li, Sr and Ca (and sodium): the invented demo file's own truth.
    for (const species of ["K I", "Li I", "Sr I", "Ca I"])
      expect(output).toContain(`${species}: present`);
    expect(output).not.toMatch(/^(Ba I|Tl I|In I|Cu I): present/m);
  });
});
