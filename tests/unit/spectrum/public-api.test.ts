// A snapshot of the numerical core's public names (lib/spectrum/index.ts), so that any change to the
// API shows up in review as a change to this snapshot. Update with `npx vitest run -u` when intended.
import { expect, it } from "vitest";
import * as core from "@/lib/spectrum";

it("exports the same public names as before", () => {
  expect(Object.keys(core).sort()).toMatchSnapshot();
});
