// The layers' arrows (.dependency-cruiser.cjs, DEVELOPERS.md "Layers") checked over the whole tree:
// no import cycles, a pure numerical core, components that reach into app/ only for server actions,
// demo data that never uses test support, models reached only through services, reports that take
// nothing from services, and no import the graph cannot follow.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { cruise, type ICruiseResult, type IViolation } from "dependency-cruiser";
import extractDepcruiseOptions from "dependency-cruiser/config-utl/extract-depcruise-options";
import extractTSConfig from "dependency-cruiser/config-utl/extract-ts-config";
import { beforeAll, describe, expect, it } from "vitest";

const root = path.resolve(__dirname, "../../..");
const sources = ["app", "components", "lib", "models", "db", "proxy.ts", "instrumentation.ts"];

/** The forbidden imports among `files`, under the project's rules, resolved from `baseDir` (with the
 * project's tsconfig for its `@/` paths when given). */
async function violationsOf(
  baseDir: string,
  files: string[],
  tsConfigFile?: string,
): Promise<IViolation[]> {
  const { tsConfig, ...options } = await extractDepcruiseOptions(
    path.join(root, ".dependency-cruiser.cjs"),
  );
  const previous = process.cwd();
  process.chdir(baseDir);
  try {
    const { output } = await cruise(
      files,
      {
        ...options,
        ...(tsConfigFile ? { tsConfig: { ...tsConfig, fileName: tsConfigFile } } : {}),
      },
      {},
      tsConfigFile ? { tsConfig: extractTSConfig(tsConfigFile) } : {},
    );
    return (output as ICruiseResult).summary.violations;
  } finally {
    process.chdir(previous);
  }
}

function describeViolation(v: IViolation): string {
  const cycle = v.cycle?.map((step) => step.name).join(" → ");
  return `${v.rule.name}: ${v.from} → ${cycle ?? v.to}`;
}

// The rule names, in the order the configuration lists them.
const ruleNames = [
  "no-cycles",
  "core-is-pure",
  "components-use-only-actions-from-app",
  "db-never-imports-tests",
  "only-services-use-models",
  "reports-do-not-import-services",
  "every-import-resolves",
];

describe("the import graph", () => {
  let violations: IViolation[] = [];
  beforeAll(async () => {
    violations = await violationsOf(root, sources, path.join(root, "tsconfig.json"));
  }, 60_000);

  it.each(ruleNames)("keeps the rule %s", (name) => {
    expect(violations.filter((v) => v.rule.name === name).map(describeViolation)).toEqual([]);
  });
});

describe("the rules themselves", () => {
  it("are the ones this test names", async () => {
    const { ruleSet } = await extractDepcruiseOptions(path.join(root, ".dependency-cruiser.cjs"));
    expect(ruleSet?.forbidden?.map((rule) => rule.name)).toEqual(ruleNames);
  });

  // A small tree that breaks every rule once, so that a rule which cannot fire is noticed.
  const files: Record<string, string> = {
    "lib/spectrum/a.ts":
      'import { b } from "./b";\nimport fs from "node:fs";\nexport const a = () => b() + String(fs);\n',
    "lib/spectrum/b.ts": 'import { a } from "./a";\nexport const b = () => typeof a;\n',
    "components/x/panel.tsx":
      'import { page } from "../../app/area/page";\nexport const panel = page;\n',
    "app/area/page.tsx": "export const page = 1;\n",
    "db/demo/make.ts":
      'import { helper } from "../../tests/support/helper";\nexport const make = helper;\n',
    "tests/support/helper.ts": "export const helper = 1;\n",
    "lib/validation/form.ts":
      'import { model } from "../../models/run";\nexport const form = model;\n',
    "models/run.ts": "export const model = 1;\n",
    "lib/reports/report.ts":
      'import { service } from "../services/runs";\nexport const report = service;\n',
    "lib/services/runs.ts": 'import { gone } from "./missing";\nexport const service = gone;\n',
  };

  it("fires each rule on a tree that breaks it", async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "emberline-arch-"));
    try {
      for (const [name, text] of Object.entries(files)) {
        fs.mkdirSync(path.dirname(path.join(dir, name)), { recursive: true });
        fs.writeFileSync(path.join(dir, name), text);
      }
      const found = await violationsOf(dir, ["app", "components", "lib", "models", "db"]);
      const fired = new Set(found.map((v) => v.rule.name));
      expect([...fired].sort()).toEqual([...ruleNames].sort());
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  }, 60_000);
});
