// ESLint (flat config): typescript-eslint's recommended rules, React's hooks rules for the
// islands, and the two import boundaries (shared/style.md): lib/ is pure TypeScript, and the
// islands and pure feature modules import neither the database, the server nor Node.
// eslint-config-prettier comes last so no rule argues with the formatter (Prettier owns layout).
import js from "@eslint/js";
import tseslint from "typescript-eslint";
import reactHooks from "eslint-plugin-react-hooks";
import prettier from "eslint-config-prettier";
import comments from "@eslint-community/eslint-plugin-eslint-comments";
import globals from "globals";

/** What lib/ may not import: the app, the frameworks, the database and Node (tests/engine/lib-rules.test.ts says the same). */
const libForbidden = [
  { group: ["node:*"], message: "lib/ is pure TypeScript: no Node built-ins (only lib/cli/main.ts may use them)." },
  { group: ["astro", "astro:*", "astro/*", "@astrojs/*"], message: "lib/ does not depend on Astro." },
  { group: ["react", "react/*", "react-dom", "react-dom/*"], message: "lib/ does not depend on React." },
  { group: ["drizzle-*", "mysql2", "mysql2/*"], message: "lib/ does not touch the database." },
  { group: ["@/*", "**/src/*", "**/src/**"], message: "lib/ does not import the app (src/)." },
];

/** What islands and pure feature modules may not import (tests/unit/app-rules.test.ts says the same). */
const pureForbidden = [
  {
    group: ["@/db", "@/db/*", "**/db/schema", "**/db/schema/*"],
    message:
      "Islands and pure modules do not import the database schema; take the type from the feature's pure module.",
  },
  {
    group: ["@/server", "@/server/*", "**/server/*", "**/server/**"],
    message: "Islands and pure modules do not import server code.",
  },
  {
    group: ["**/*.server", "*.server", "**/*.server.ts"],
    message: "Islands and pure modules do not import *.server modules.",
  },
  {
    group: ["node:*"],
    message: "Islands and pure modules run in the browser or the engine worker: no Node built-ins.",
  },
];

export default tseslint.config(
  {
    ignores: ["dist/", "dist-*/", ".astro/", ".data/", "node_modules/", "tests/output/", "public/", "drizzle/"],
  },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: {
      ecmaVersion: 2023,
      sourceType: "module",
      globals: { ...globals.node, ...globals.browser },
    },
    linterOptions: { reportUnusedDisableDirectives: "error" },
    plugins: { "eslint-comments": comments },
    rules: {
      // A disable comment names the rule it disables.
      "eslint-comments/no-unlimited-disable": "error",
      "@typescript-eslint/no-unused-vars": [
        "error",
        { argsIgnorePattern: "^_", varsIgnorePattern: "^_", caughtErrors: "none" },
      ],
    },
  },
  {
    files: ["src/**/*.tsx"],
    plugins: { "react-hooks": reactHooks },
    rules: {
      "react-hooks/rules-of-hooks": "error",
      "react-hooks/exhaustive-deps": "error",
    },
  },
  {
    files: ["lib/**/*.ts"],
    ignores: ["lib/cli/main.ts"],
    rules: { "no-restricted-imports": ["error", { patterns: libForbidden }] },
  },
  {
    files: ["lib/cli/main.ts"],
    rules: { "no-restricted-imports": ["error", { patterns: libForbidden.slice(1) }] },
  },
  {
    files: ["src/features/**/*.{ts,tsx}", "src/components/**/*.{ts,tsx}"],
    ignores: ["**/*.server.ts"],
    rules: { "no-restricted-imports": ["error", { patterns: pureForbidden }] },
  },
  prettier,
);
