// The dependency rule of lib/: pure TypeScript with no app, framework, database or Node imports.
import { readFileSync } from "node:fs";
import { join, relative } from "node:path";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { sourceFiles, specifiers } from "../support/sourceImports";

const root = fileURLToPath(new URL("../..", import.meta.url));
const libDir = join(root, "lib");

const FORBIDDEN: [RegExp, string][] = [
  [/^node:/, "Node built-ins (node:*)"],
  [
    /^(fs|path|child_process|os|http|https|net|url|util|stream|worker_threads|process|buffer|crypto)(\/|$)/,
    "Node built-ins",
  ],
  [/^astro(:|\/|$)/, "Astro"],
  [/^@astrojs\//, "Astro integrations"],
  [/^react(-dom)?(\/|$)/, "React"],
  [/^drizzle-/, "Drizzle"],
  [/^mysql2/, "the database driver"],
  [/^@\//, "the app (src/)"],
];

describe("lib/ dependency rule (shared/style.md, habit 14)", () => {
  const files = sourceFiles(libDir);

  it("finds the engine's files and reads their imports", () => {
    expect(files.length).toBeGreaterThan(40);
    expect(
      specifiers(
        'import { a } from "x";\nexport * from "./y.ts";\nimport type { T } from "node:fs";\nconst m = await import("react");',
      ),
    ).toEqual(["x", "./y.ts", "node:fs", "react"]);
  });

  it("nothing in lib/ imports src/, astro:*, React, Drizzle or node:* (only lib/cli/main.ts may use node:*)", () => {
    const offences: string[] = [];
    for (const file of files) {
      const rel = relative(root, file).split("\\").join("/");
      for (const spec of specifiers(readFileSync(file, "utf8"))) {
        if (rel === "lib/cli/main.ts" && /^node:/.test(spec)) continue;
        for (const [re, what] of FORBIDDEN) if (re.test(spec)) offences.push(`${rel} imports ${spec} (${what})`);
        if (spec.startsWith(".")) {
          const target = relative(root, join(file, "..", spec))
            .split("\\")
            .join("/");
          if (!target.startsWith("lib/")) offences.push(`${rel} imports ${spec}, outside lib/`);
        }
      }
    }
    expect(offences).toEqual([]);
  });
});
