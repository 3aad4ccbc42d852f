// Which folder may import which: the layer rule in DEVELOPERS.md ("Layers"), checked by `npm run lint`.
//
//   app ──> components ──> server ──> db ──> lib/domain
//    │          │            │         └──> lib/env.ts, lib/errors.ts
//    │          │            └──> lib (domain, validation, env, errors), reports
//    │          └──> lib/domain, lib/validation, server actions, DTO types (import type) from db/queries and server
//    └──> db/queries (viewer-first reads) and any type; never the db client, schema values or mutations
//
// Paths are resolved (tsconfig "@/*" included), so a relative import cannot slip past a rule.
// "import type" counts only where a rule says so (dependencyTypesNot: ["type-only"]).
const LOCAL = "^(app|components|server|db|lib|reports|scripts|tests|types)/|^[^/]+\\.(ts|tsx|mts)$";
// Packages that tie code to the framework, the database, the mail server or native binaries.
const INFRASTRUCTURE =
  "^node_modules/(next|react|react-dom|next-auth|server-only|drizzle-orm|mysql2|nodemailer|smtp-server|mailparser|sharp|@node-rs|@react-pdf|@tanstack)/";
const TYPE_ONLY = ["type-only"];

module.exports = {
  forbidden: [
    {
      name: "domain-imports-only-domain",
      comment: "lib/domain is plain TypeScript that any layer, the browser included, may run: it imports only lib/domain.",
      severity: "error",
      from: { path: "^lib/domain/" },
      to: { path: LOCAL, pathNot: "^lib/domain/" },
    },
    {
      name: "domain-no-framework-or-node",
      comment: "lib/domain uses no framework, database, mail or native package and no Node built-in (it must run in a client component).",
      severity: "error",
      from: { path: "^lib/domain/" },
      to: { path: INFRASTRUCTURE },
    },
    {
      name: "domain-no-node-builtins",
      comment: "lib/domain must run in the browser too: no node: modules.",
      severity: "error",
      from: { path: "^lib/domain/" },
      to: { dependencyTypes: ["core"] },
    },
    {
      name: "validation-imports-domain",
      comment: "Zod schemas are shared by forms and actions: they import lib/domain and lib/validation only.",
      severity: "error",
      from: { path: "^lib/validation/" },
      to: { path: LOCAL, pathNot: "^lib/(domain|validation)/" },
    },
    {
      name: "validation-no-framework-or-node",
      severity: "error",
      from: { path: "^lib/validation/" },
      to: { path: INFRASTRUCTURE },
    },
    {
      name: "lib-imports-no-upper-layer",
      comment: "Nothing in lib/ (env.ts and errors.ts included) reaches into app, components, server, db or reports.",
      severity: "error",
      from: { path: "^lib/" },
      to: { path: "^(app|components|server|db|reports)/" },
    },
    {
      name: "db-imports-domain-env-errors",
      comment: "db/ is persistence only: it takes types and vocabulary from lib/domain, plus lib/env.ts and lib/errors.ts. Decisions, tokens, mails and form input belong to server/.",
      severity: "error",
      // db/seed.ts is a script: it publishes the demo's published trials through the publish use case.
      from: { path: "^db/", pathNot: "^db/seed\\.ts$" },
      to: { path: LOCAL, pathNot: "^(db/|lib/domain/|lib/env\\.ts$|lib/errors\\.ts$)" },
    },
    {
      name: "db-takes-types-and-vocabulary-from-domain",
      comment:
        "db/ takes values from lib/domain only for vocabulary and for the permission predicates that scope a query or re-check ownership in SQL; anything else (randomising, parsing values, schedules, flags, mails) is a decision made in server/ before the rows reach db/. Seeding is a script and draws demo layouts like the randomise use case.",
      severity: "error",
      from: { path: "^db/", pathNot: "^db/seed\\.ts$" },
      to: { path: "^lib/domain/", pathNot: "^lib/domain/(vocabulary/|permissions\\.ts$)", dependencyTypesNot: TYPE_ONLY },
    },
    {
      name: "server-not-to-ui",
      comment: "Use cases in server/ never import pages or components.",
      severity: "error",
      from: { path: "^server/" },
      to: { path: "^(app|components)/" },
    },
    {
      name: "components-no-db-values",
      comment: "Components get data as props or through route handlers; from db/queries they may take DTO types only.",
      severity: "error",
      from: { path: "^components/" },
      to: { path: "^db/queries/", dependencyTypesNot: TYPE_ONLY },
    },
    {
      name: "components-only-query-types-from-db",
      severity: "error",
      from: { path: "^components/" },
      to: { path: "^db/", pathNot: "^db/queries/" },
    },
    {
      name: "components-call-only-server-actions",
      comment: "A component may call a server action (server/actions/*, not define-action) and take types from server/; any other server module stays on the server.",
      severity: "error",
      from: { path: "^components/" },
      to: { path: "^server/", pathNot: "^server/actions/(?!define-action\\.ts$)", dependencyTypesNot: TYPE_ONLY },
    },
    {
      name: "components-not-to-env-or-app",
      comment: "Settings reach components as props; components never import routes.",
      severity: "error",
      from: { path: "^components/" },
      to: { path: "^(lib/env\\.ts$|app/)" },
    },
    {
      name: "app-reads-db-through-queries-only",
      comment: "Pages and route handlers read through db/queries (viewer first, scoped in SQL) and write through server/; never the db client, schema tables, access helpers or mutations.",
      severity: "error",
      from: { path: "^app/" },
      to: { path: "^db/", pathNot: "^db/queries/", dependencyTypesNot: TYPE_ONLY },
    },
    {
      name: "reports-render-prepared-data",
      comment: "PDF documents render one prepared DTO: lib/domain, reports, and types only.",
      severity: "error",
      from: { path: "^reports/" },
      to: { path: "^(app|components|server|db)/", dependencyTypesNot: TYPE_ONLY },
    },
    {
      name: "nothing-imports-app",
      comment: "Routes are entry points; only tests import them (to call route handlers directly).",
      severity: "error",
      from: { pathNot: "^(app|tests)/" },
      to: { path: "^app/" },
    },
    {
      name: "not-to-unresolvable",
      comment: "An import that resolves to no file is a broken move or a missing package.",
      severity: "error",
      from: {},
      to: { couldNotResolve: true },
    },
  ],
  required: [
    {
      name: "server-modules-are-server-only",
      comment: 'Every module under server/ imports "server-only", so reaching one from a client component fails the build.',
      severity: "error",
      module: { path: "^server/.+\\.(ts|tsx)$" },
      to: { path: "^node_modules/server-only/" },
    },
  ],
  options: {
    doNotFollow: { path: "node_modules" },
    exclude: { path: "^(\\.next|\\.next-[^/]+|\\.data|db/migrations)/" },
    tsConfig: { fileName: "tsconfig.json" },
    tsPreCompilationDeps: true,
    enhancedResolveOptions: {
      exportsFields: ["exports"],
      conditionNames: ["import", "require", "node", "default", "types"],
      extensions: [".ts", ".tsx", ".d.ts", ".js", ".mjs", ".cjs", ".json"],
      mainFields: ["module", "main", "types", "typings"],
    },
    reporterOptions: { text: { highlightFocused: true } },
  },
};
