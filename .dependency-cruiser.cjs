// The arrows between the layers (DEVELOPERS.md, "Layers"). tests/unit/architecture.test.ts checks the
// whole tree against these rules in `npm test`; `npx depcruise app components lib models db` prints
// the same report by hand.
/** @type {import('dependency-cruiser').IConfiguration} */
module.exports = {
  forbidden: [
    {
      name: "no-cycles",
      comment:
        "Imports point one way: a cycle (type-only imports included) means a type or rule sits in the wrong file.",
      severity: "error",
      from: {},
      to: { circular: true },
    },
    {
      name: "core-is-pure",
      comment:
        "lib/spectrum, the numerical core, imports only itself and its numeric and parsing packages: no I/O, no services, no Node built-ins.",
      severity: "error",
      from: { path: "^lib/spectrum/" },
      to: {
        pathNot: [
          "^lib/spectrum/",
          "^node_modules/(ml-levenberg-marquardt|ml-matrix|ml-regression-theil-sen|jstat|papaparse)/",
        ],
      },
    },
    {
      name: "components-use-only-actions-from-app",
      comment: "Components import nothing from app/ but its server actions.",
      severity: "error",
      from: { path: "^components/" },
      to: { path: "^app/", pathNot: "^app/.*/actions\\.ts$" },
    },
    {
      name: "db-never-imports-tests",
      comment: "Demo data and seeds use generators from lib/, never test support.",
      severity: "error",
      from: { path: "^db/" },
      to: { path: "^tests/" },
    },
    {
      name: "only-services-use-models",
      comment:
        "Models are reached through services; db/ (seeds, migrations) and models/ itself are the data layer.",
      severity: "error",
      from: {
        path: "^(app|components|lib|proxy\\.ts|instrumentation\\.ts)",
        pathNot: "^lib/services/",
      },
      to: { path: "^models/" },
    },
    {
      name: "reports-do-not-import-services",
      comment: "lib/reports renders what services hand it; its input types live outside services.",
      severity: "error",
      from: { path: "^lib/reports/" },
      to: { path: "^lib/services/" },
    },
    {
      name: "every-import-resolves",
      comment: "An import the graph cannot follow is one these rules cannot check.",
      severity: "error",
      from: {},
      to: { couldNotResolve: true },
    },
  ],
  options: {
    doNotFollow: { path: "node_modules" },
    tsPreCompilationDeps: true,
    tsConfig: { fileName: "tsconfig.json" },
    enhancedResolveOptions: {
      exportsFields: ["exports"],
      conditionNames: ["import", "require", "node", "default", "types"],
      extensions: [".ts", ".tsx", ".js", ".mjs", ".cjs", ".json"],
    },
  },
};
