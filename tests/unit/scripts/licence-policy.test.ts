// The licence check's pure part: which packages a production install holds, how SPDX expressions are
// judged, and that a non-commercial package slipped into the real lockfile fails the check.
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import {
  assertAllowList,
  categoryOfLicence,
  checkLicences,
  licenceOfManifest,
  productionPackages,
  type Lockfile,
  type ProductionPackage,
} from "../../../scripts/licences/licence-policy";
import { installedLicence } from "../../../scripts/licences/installed-licence";

const root = path.resolve(__dirname, "../../..");
const realLock = (): Lockfile =>
  JSON.parse(fs.readFileSync(path.join(root, "package-lock.json"), "utf8")) as Lockfile;
const realAllowList = () =>
  assertAllowList(
    JSON.parse(fs.readFileSync(path.join(root, "licence-allow-list.json"), "utf8")) as unknown,
  );
/** The licence as the lockfile records it (npm copies it from each package.json). */
const fromLock = (lock: Lockfile) => (pkg: ProductionPackage) =>
  licenceOfManifest({ license: lock.packages?.[pkg.path]?.license });

describe("judging a licence expression", () => {
  it.each([
    ["MIT", "permissive"],
    ["Apache-2.0", "permissive"],
    ["(MIT OR CC0-1.0)", "permissive"],
    // An OR lets the licensee choose: the MIT half suffices.
    ["(MIT OR EUPL-1.1+)", "permissive"],
    ["GPL-3.0-or-later", "copyleft"],
    ["LGPL-3.0-or-later", "copyleft"],
    ["MPL-2.0", "copyleft"],
    ["CC-BY-SA-4.0", "copyleft"],
    // An AND binds the licensee to every part: the worst one counts.
    ["Apache-2.0 AND LGPL-3.0-or-later", "copyleft"],
    ["CC-BY-NC-SA-4.0", "non-commercial"],
    ["CC-BY-NC-4.0", "non-commercial"],
    ["PolyForm-Noncommercial-1.0.0", "non-commercial"],
    ["MIT AND Commons-Clause", "non-commercial"],
    ["(MIT OR CC-BY-NC-4.0) AND GPL-2.0-only", "copyleft"],
    ["GPL-2.0-only WITH Classpath-exception-2.0", "copyleft"],
    ["UNLICENSED", "unknown"],
    ["SEE LICENSE IN LICENSE.txt", "unknown"],
    ["Some-Custom-Licence", "unknown"],
    ["(MIT", "unknown"],
    [null, "unknown"],
  ])("%s is %s", (expression, category) => {
    expect(categoryOfLicence(expression)).toBe(category);
  });

  it("reads license as a string or {type}, and the old licenses array as alternatives", () => {
    expect(licenceOfManifest({ license: "ISC" })).toBe("ISC");
    expect(licenceOfManifest({ license: { type: "MIT", url: "x" } })).toBe("MIT");
    expect(licenceOfManifest({ licenses: [{ type: "MIT" }, { type: "Apache-2.0" }] })).toBe(
      "(MIT OR Apache-2.0)",
    );
    expect(licenceOfManifest({ name: "png-js" })).toBeNull();
  });
});

describe("the production tree", () => {
  const lock: Lockfile = {
    lockfileVersion: 3,
    packages: {
      "": {
        dependencies: { app: "1" },
        optionalDependencies: { fsevents: "1" },
        devDependencies: { "nc-test-tool": "1" },
      },
      "node_modules/app": {
        version: "1.0.0",
        license: "MIT",
        dependencies: { helper: "^2" },
        peerDependencies: { react: "*", "left-out": "*" },
        peerDependenciesMeta: { "left-out": { optional: true } },
      },
      // Two versions: the nested one is what app gets, the top one is another package's.
      "node_modules/app/node_modules/helper": {
        version: "2.0.0",
        license: "CC-BY-NC-SA-4.0",
      },
      "node_modules/helper": { version: "1.0.0", license: "MIT", dev: true },
      "node_modules/react": { version: "19.0.0", license: "MIT" },
      "node_modules/left-out": { version: "1.0.0", license: "GPL-3.0-only" },
      "node_modules/nc-test-tool": { version: "1.0.0", license: "CC-BY-NC-4.0", dev: true },
    },
  };

  it("follows dependencies as Node resolves them, with peers, and leaves dev and optional peers out", () => {
    const found = productionPackages(lock);
    expect(found.map((p) => p.path)).toEqual([
      "node_modules/app",
      "node_modules/app/node_modules/helper",
      "node_modules/react",
    ]);
    expect(found[1].via).toEqual(["app", "helper"]);
  });

  it("fails on a transitive non-commercial package and names the way in", () => {
    const report = checkLicences(productionPackages(lock), fromLock(lock), []);
    expect(report.failures.map((f) => [f.package.name, f.category, f.package.via])).toEqual([
      ["helper", "non-commercial", ["app", "helper"]],
    ]);
  });

  it("refuses a lockfile that lacks a required dependency", () => {
    const broken: Lockfile = {
      packages: { "": { dependencies: { gone: "1" } }, "node_modules/x": {} },
    };
    expect(() => productionPackages(broken)).toThrow(/gone is needed but package-lock.json/);
  });
});

describe("the real lockfile", () => {
  // Licences as `npm run licences` reads them: the installed package.json's, else the lockfile's copy.
  const installed = (lock: Lockfile) => installedLicence(root, lock);

  it("passes with the reviewed allow-list, and every allow-list entry is used", () => {
    const lock = realLock();
    const report = checkLicences(productionPackages(lock), installed(lock), realAllowList());
    expect(report.failures).toEqual([]);
    expect(report.unusedAllowances).toEqual([]);
    // jcampconverter (CC-BY-NC-SA-4.0) is gone from the tree, and so is every other non-commercial licence.
    expect(report.findings.some((f) => f.package.name === "jcampconverter")).toBe(false);
    expect(report.findings.filter((f) => f.category === "non-commercial")).toEqual([]);
  });

  it("fails when a non-commercial package is added under a production dependency", () => {
    const lock = realLock();
    const packages = lock.packages!;
    packages["node_modules/next"] = {
      ...packages["node_modules/next"],
      dependencies: { ...packages["node_modules/next"].dependencies, "nc-chart-helper": "^1" },
    };
    packages["node_modules/nc-chart-helper"] = { version: "1.0.0", license: "CC-BY-NC-SA-4.0" };
    const report = checkLicences(productionPackages(lock), installed(lock), realAllowList());
    expect(report.failures).toHaveLength(1);
    expect(report.failures[0]).toMatchObject({
      licence: "CC-BY-NC-SA-4.0",
      category: "non-commercial",
      package: { name: "nc-chart-helper", via: ["next", "nc-chart-helper"] },
    });
  });

  it("does not let an allow-list entry clear a licence other than the one reviewed", () => {
    const lock = realLock();
    const relicensed = (pkg: ProductionPackage) =>
      pkg.name === "png-js" ? "AGPL-3.0" : installed(lock)(pkg);
    const report = checkLicences(productionPackages(lock), relicensed, realAllowList());
    expect(report.failures.map((f) => f.package.name)).toEqual(["png-js"]);
    expect(report.unusedAllowances.map((e) => e.package)).toEqual(["png-js"]);
  });

  it("checks the allow-list's shape", () => {
    expect(() => assertAllowList({ reviewed: [{ package: "x", licence: "MIT" }] })).toThrow(
      /needs a non-empty "reason"/,
    );
    expect(() => assertAllowList({})).toThrow(/"reviewed" array/);
  });
});
