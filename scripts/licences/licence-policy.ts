// The licence policy for what Emberline ships, as pure functions: which packages of package-lock.json a
// production install holds, how an SPDX expression is judged, and which findings the reviewed allow-list
// clears. scripts/check-licences.ts feeds it the lockfile and the installed package.json files.

/** One entry of package-lock.json's `packages` (lockfileVersion 2 or 3), the fields read here. */
export interface LockPackage {
  name?: string;
  version?: string;
  license?: unknown;
  dev?: boolean;
  optional?: boolean;
  dependencies?: Record<string, string>;
  /** Read by nothing here: a production install leaves them out. */
  devDependencies?: Record<string, string>;
  optionalDependencies?: Record<string, string>;
  peerDependencies?: Record<string, string>;
  peerDependenciesMeta?: Record<string, { optional?: boolean }>;
}

export interface Lockfile {
  lockfileVersion?: number;
  packages?: Record<string, LockPackage>;
}

/** A package of the production tree: its place in node_modules and how it got there. */
export interface ProductionPackage {
  /** The key in `packages`, e.g. "node_modules/@img/sharp-libvips-linux-x64". */
  path: string;
  name: string;
  version: string;
  /** True when every way in is an optional dependency (a platform binary, say). */
  optional: boolean;
  /** The chain of package names from the project to this one, for the report. */
  via: string[];
}

export type LicenceCategory = "permissive" | "copyleft" | "unknown" | "non-commercial";

/** Worse categories last: an AND takes the worst of its parts, an OR the best. */
const RANK: Record<LicenceCategory, number> = {
  permissive: 0,
  copyleft: 1,
  unknown: 2,
  "non-commercial": 3,
};

/**
 * Licences that let a company ship Emberline without share-alike or use restrictions (attribution and
 * a notice at most). Anything not named here is judged unknown until someone reviews it.
 */
const PERMISSIVE = new Set(
  [
    "0BSD",
    "Apache-2.0",
    "BlueOak-1.0.0",
    "BSD-2-Clause",
    "BSD-3-Clause",
    "CC-BY-3.0",
    "CC-BY-4.0",
    "CC0-1.0",
    "ISC",
    "MIT",
    "MIT-0",
    "Python-2.0",
    "Unlicense",
    "WTFPL",
    "Zlib",
  ].map((id) => id.toUpperCase()),
);

/** Share-alike and copyleft families (SPDX ids start with these). */
const COPYLEFT_PREFIXES = [
  "AGPL-",
  "GPL-",
  "LGPL-",
  "MPL-",
  "EPL-",
  "EUPL-",
  "CDDL-",
  "CPL-",
  "OSL-",
  "CECILL",
  "OFL-",
  "SSPL-",
  "ODBL-",
];

/** The category of one SPDX licence id (an "or later" + and the -only/-or-later forms are the same family). */
export function categoryOfLicenceId(id: string): LicenceCategory {
  const upper = id.trim().toUpperCase();
  if (upper === "") return "unknown";
  // Creative Commons NC variants, PolyForm Noncommercial, the Commons Clause, source-available terms that
  // forbid production or competing commercial use.
  if (
    /(^|-)NC(-|$)/.test(upper) ||
    upper.includes("NONCOMMERCIAL") ||
    upper.includes("COMMONS-CLAUSE") ||
    upper.startsWith("BUSL-") ||
    upper.startsWith("ELASTIC-") ||
    upper.startsWith("POLYFORM-")
  )
    return "non-commercial";
  if (/(^|-)SA(-|$)/.test(upper) || COPYLEFT_PREFIXES.some((p) => upper.startsWith(p)))
    return "copyleft";
  if (PERMISSIVE.has(upper.replace(/\+$/, ""))) return "permissive";
  return "unknown";
}

/**
 * The category of an SPDX licence expression ("MIT", "(MIT OR EUPL-1.1+)", "Apache-2.0 AND
 * LGPL-3.0-or-later"): OR takes the best alternative (the licensee chooses), AND the worst part,
 * "X WITH exception" is judged as X. Text that is no expression (UNLICENSED, "SEE LICENSE IN …",
 * nothing at all) is unknown.
 */
export function categoryOfLicence(expression: string | null): LicenceCategory {
  if (expression === null) return "unknown";
  const tokens = expression.match(/\(|\)|[^\s()]+/g) ?? [];
  if (tokens.length === 0) return "unknown";
  let at = 0;
  const fail = (): never => {
    throw new SyntaxError(`not an SPDX expression: ${expression}`);
  };
  const orExpression = (): LicenceCategory => {
    let best = andExpression();
    while (tokens[at]?.toUpperCase() === "OR") {
      at++;
      const next = andExpression();
      if (RANK[next] < RANK[best]) best = next;
    }
    return best;
  };
  const andExpression = (): LicenceCategory => {
    let worst = atom();
    while (tokens[at]?.toUpperCase() === "AND") {
      at++;
      const next = atom();
      if (RANK[next] > RANK[worst]) worst = next;
    }
    return worst;
  };
  const atom = (): LicenceCategory => {
    const token = tokens[at++];
    if (token === undefined || token === ")") return fail();
    if (token === "(") {
      const inner = orExpression();
      if (tokens[at++] !== ")") fail();
      return inner;
    }
    if (["AND", "OR", "WITH"].includes(token.toUpperCase())) return fail();
    if (tokens[at]?.toUpperCase() === "WITH") {
      at++;
      if (tokens[at++] === undefined) fail();
    }
    return categoryOfLicenceId(token);
  };
  try {
    const category = orExpression();
    return at === tokens.length ? category : "unknown";
  } catch (error) {
    if (error instanceof SyntaxError) return "unknown";
    throw error;
  }
}

/**
 * The licence text a package.json states: `license` as a string or `{type}`, or the old `licenses`
 * array (joined with OR: each was an alternative); null when it states none.
 */
export function licenceOfManifest(manifest: Record<string, unknown> | null): string | null {
  if (manifest === null) return null;
  const read = (value: unknown): string | null => {
    if (typeof value === "string") return value.trim() === "" ? null : value.trim();
    if (
      value &&
      typeof value === "object" &&
      typeof (value as { type?: unknown }).type === "string"
    )
      return read((value as { type: string }).type);
    return null;
  };
  const single = read(manifest.license);
  if (single !== null) return single;
  if (Array.isArray(manifest.licenses)) {
    const all = manifest.licenses.map(read).filter((l): l is string => l !== null);
    if (all.length === 1) return all[0];
    if (all.length > 1) return `(${all.join(" OR ")})`;
  }
  return null;
}

/** Where Node would find `name` required from the package at `from` ("" is the project). */
function resolveInLock(
  packages: Record<string, LockPackage>,
  from: string,
  name: string,
): string | null {
  let base = from;
  for (;;) {
    const candidate = `${base === "" ? "" : `${base}/`}node_modules/${name}`;
    if (packages[candidate] !== undefined) return candidate;
    if (base === "") return null;
    const cut = base.lastIndexOf("/node_modules/");
    base = cut === -1 ? "" : base.slice(0, cut);
  }
}

/**
 * Every package a production install (`npm ci --omit=dev`) brings: the project's dependencies and
 * optionalDependencies, then theirs, and the peer dependencies npm installs with them (peers marked
 * optional are left out), found as Node would find them in node_modules. Platform packages of other
 * systems are included: the lockfile, not this machine, decides what a customer may install.
 * Throws when a required dependency is not in the lockfile (the lockfile is then out of date).
 */
export function productionPackages(lock: Lockfile): ProductionPackage[] {
  const packages = lock.packages;
  if (!packages || typeof packages !== "object" || packages[""] === undefined)
    throw new RangeError(
      'package-lock.json has no `packages` map with the project at "" (lockfileVersion 2 or 3 is needed)',
    );
  const found = new Map<string, ProductionPackage>();
  const queue: { path: string; optional: boolean; via: string[] }[] = [
    { path: "", optional: false, via: [] },
  ];
  while (queue.length > 0) {
    const { path, optional, via } = queue.shift()!;
    const entry = packages[path];
    const wanted: [string, boolean][] = [
      ...Object.keys(entry.dependencies ?? {}).map((n): [string, boolean] => [n, false]),
      ...Object.keys(entry.optionalDependencies ?? {}).map((n): [string, boolean] => [n, true]),
      ...Object.keys(entry.peerDependencies ?? {})
        .filter((n) => !entry.peerDependenciesMeta?.[n]?.optional)
        .map((n): [string, boolean] => [n, false]),
    ];
    for (const [name, isOptional] of wanted) {
      const at = resolveInLock(packages, path, name);
      if (at === null) {
        if (isOptional) continue;
        throw new RangeError(
          `${[...via, name].join(" → ")} is needed but package-lock.json has no entry for it: run npm install to bring the lockfile up to date`,
        );
      }
      const childOptional = optional || isOptional;
      const known = found.get(at);
      if (known) {
        // Reached again by a required path: it is then not optional after all.
        if (known.optional && !childOptional) {
          known.optional = false;
          queue.push({ path: at, optional: false, via: known.via });
        }
        continue;
      }
      const child = packages[at];
      const record: ProductionPackage = {
        path: at,
        name: child.name ?? at.slice(at.lastIndexOf("node_modules/") + "node_modules/".length),
        version: child.version ?? "",
        optional: childOptional,
        via: [...via, name],
      };
      found.set(at, record);
      queue.push({ path: at, optional: childOptional, via: record.via });
    }
  }
  return [...found.values()].sort((a, b) => a.path.localeCompare(b.path));
}

/** One reviewed exception: a package (a trailing * matches a family) under the exact licence reviewed. */
export interface AllowListEntry {
  package: string;
  licence: string;
  reason: string;
}

export interface LicenceFinding {
  package: ProductionPackage;
  licence: string | null;
  category: LicenceCategory;
  /** The allow-list entry that clears it, when one does. */
  allowedBy: AllowListEntry | null;
}

export interface LicenceReport {
  /** Every production package with its licence and category. */
  findings: LicenceFinding[];
  /** Findings that fail the check: not permissive and not cleared by the allow-list. */
  failures: LicenceFinding[];
  /** Allow-list entries that clear nothing (stale: the package left or changed its licence). */
  unusedAllowances: AllowListEntry[];
}

/** Checks the allow-list's shape: every entry names a package, the licence reviewed and why. */
export function assertAllowList(value: unknown): AllowListEntry[] {
  const entries = (value as { reviewed?: unknown } | null)?.reviewed;
  if (!Array.isArray(entries)) throw new RangeError('the allow-list needs a "reviewed" array');
  return entries.map((entry, i) => {
    const e = entry as Partial<AllowListEntry> | null;
    for (const field of ["package", "licence", "reason"] as const) {
      if (typeof e?.[field] !== "string" || e[field].trim() === "")
        throw new RangeError(`allow-list entry ${i + 1} needs a non-empty "${field}"`);
    }
    return { package: e!.package!, licence: e!.licence!, reason: e!.reason! };
  });
}

function allows(entry: AllowListEntry, name: string, licence: string | null): boolean {
  const matchesName = entry.package.endsWith("*")
    ? name.startsWith(entry.package.slice(0, -1))
    : name === entry.package;
  return matchesName && entry.licence === (licence ?? "NONE");
}

/**
 * Judges every production package's licence: permissive passes; non-commercial, copyleft and unknown
 * fail unless an allow-list entry names the package and that exact licence text (a changed licence
 * needs a new review). `licenceOf` gives the licence text of a package (null when it states none).
 */
export function checkLicences(
  packages: readonly ProductionPackage[],
  licenceOf: (pkg: ProductionPackage) => string | null,
  allowList: readonly AllowListEntry[],
): LicenceReport {
  const used = new Set<AllowListEntry>();
  const findings = packages.map((pkg): LicenceFinding => {
    const licence = licenceOf(pkg);
    const category = categoryOfLicence(licence);
    const allowedBy =
      category === "permissive"
        ? null
        : (allowList.find((entry) => allows(entry, pkg.name, licence)) ?? null);
    if (allowedBy) used.add(allowedBy);
    return { package: pkg, licence, category, allowedBy };
  });
  return {
    findings,
    failures: findings.filter((f) => f.category !== "permissive" && f.allowedBy === null),
    unusedAllowances: allowList.filter((entry) => !used.has(entry)),
  };
}

/** Production packages per licence text, most used first: the table the README lists. */
export function licenceSummary(
  findings: readonly LicenceFinding[],
): { licence: string; count: number; packages: string[] }[] {
  const byLicence = new Map<string, Set<string>>();
  for (const f of findings) {
    const key = f.licence ?? "NONE";
    if (!byLicence.has(key)) byLicence.set(key, new Set());
    byLicence.get(key)!.add(f.package.name);
  }
  return [...byLicence.entries()]
    .map(([licence, names]) => ({ licence, count: names.size, packages: [...names].sort() }))
    .sort((a, b) => b.count - a.count || a.licence.localeCompare(b.licence));
}
