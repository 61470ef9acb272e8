// Lint: typescript-eslint's recommended rules, plus the house layering enforced by import
// restrictions — app -> server -> (domain, db); db -> domain; domain -> nothing but domain.
import js from "@eslint/js";
import tseslint from "typescript-eslint";

const restrict = (patterns, message) => ({
  "no-restricted-imports": ["error", { patterns: patterns.map((group) => ({ group: [group], message })) }],
});

export default tseslint.config(
  { ignores: ["node_modules/**", ".next/**", ".next-*/**", "lib/generated/**", "data/**", "next-env.d.ts", "test-results/**"] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    rules: {
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_", destructuredArrayIgnorePattern: "^_" }],
      "@typescript-eslint/no-explicit-any": "error",
      "@typescript-eslint/no-non-null-assertion": "off",
    },
  },
  {
    files: ["lib/domain/**/*.ts"],
    ignores: ["lib/domain/**/*.test.ts"],
    rules: restrict(
      ["**/db/**", "**/server/**", "**/schemas/**", "**/cli/**", "**/app/**", "next", "next/*", "react", "react-dom", "@prisma/*", "better-sqlite3", "node:fs", "fs", "node:child_process"],
      "lib/domain is the pure core: no database, server, framework or file system imports.",
    ),
  },
  {
    // Tests of the core may read fixtures and run the reference scripts; the code under test may not.
    files: ["lib/domain/**/*.test.ts"],
    rules: restrict(["**/db/**", "**/server/**", "**/cli/**", "**/app/**", "next", "next/*", "react", "@prisma/*", "better-sqlite3"], "Core tests exercise the core alone."),
  },
  {
    files: ["lib/schemas/**/*.ts"],
    rules: restrict(["**/db/**", "**/server/**", "**/cli/**", "next", "next/*", "@prisma/*", "better-sqlite3", "node:*"], "lib/schemas is client-safe: domain and zod only."),
  },
  {
    files: ["lib/db/**/*.ts"],
    rules: restrict(["**/server/**", "**/cli/**", "**/app/**", "next", "next/*", "react"], "lib/db sits below lib/server: it may use domain types only."),
  },
  {
    files: ["lib/server/**/*.ts"],
    rules: restrict(["**/cli/**", "**/app/**", "next/*", "react"], "lib/server is called by routes and the CLI, never the other way."),
  },
  {
    files: ["app/**/*.ts", "app/**/*.tsx"],
    rules: {
      "no-restricted-imports": [
        "error",
        {
          patterns: [{ group: ["**/lib/db/**", "@/lib/db/*", "**/generated/**", "@prisma/*", "better-sqlite3"], message: "Routes call lib/server; only lib/server, seed and the CLI reach the database." }],
          // the actor of a request comes from its session (or local mode): app/_lib/actor.ts
          paths: [{ name: "@/lib/server/actor", importNames: ["localActor", "cliActor"], message: "Routes and actions get their actor with requestActor(request) or actionActor() from app/_lib/actor.ts." }],
        },
      ],
    },
  },
  {
    files: ["**/*.mjs", "bin/**", "scripts/**"],
    languageOptions: { globals: { process: "readonly", console: "readonly" } },
  },
);
