// The app's boundary rule (shared/style.md, habit 8): React islands (.tsx) and pure feature modules
// (x.ts beside x.server.ts) run in the browser or the engine worker, so they import neither the
// database (@/db), the server (@/server), any *.server module, nor Node's built-ins.
import { readFileSync } from "node:fs";
import { join, relative, resolve } from "node:path";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { sourceFiles, specifiers } from "../support/sourceImports";

const root = fileURLToPath(new URL("../..", import.meta.url));

/** Islands and pure modules: every .ts/.tsx under src/features and src/components except *.server.ts. */
const pureFiles = ["src/features", "src/components"]
  .flatMap((dir) => sourceFiles(join(root, dir)))
  .map((file) => relative(root, file).split("\\").join("/"))
  .filter((rel) => !rel.endsWith(".server.ts"));

/** Why a specifier may not appear in an island or a pure module, or null when it may. */
function offence(rel: string, spec: string): string | null {
  const target = spec.startsWith(".")
    ? relative(root, resolve(root, rel, "..", spec))
        .split("\\")
        .join("/")
    : spec;
  if (/^(@\/|src\/)db(\/|$)/.test(target)) return "the database schema";
  if (/^(@\/|src\/)server(\/|$)/.test(target)) return "server code";
  if (/\.server(\.ts)?$/.test(target)) return "a *.server module";
  if (/^node:/.test(target)) return "Node built-ins";
  return null;
}

describe("islands and pure modules stay pure", () => {
  it("finds the islands and pure modules, and judges specifiers as the rule says", () => {
    expect(pureFiles.length).toBeGreaterThan(60);
    expect(pureFiles.some((f) => f.endsWith(".tsx"))).toBe(true);
    const rel = "src/features/tapTables/exports.ts";
    expect(offence(rel, "@/db/schema")).toBe("the database schema");
    expect(offence(rel, "../../server/http/errors")).toBe("server code");
    expect(offence(rel, "./tapTables.server")).toBe("a *.server module");
    expect(offence(rel, "@/features/studies/studies.server")).toBe("a *.server module");
    expect(offence(rel, "node:fs")).toBe("Node built-ins");
    expect(offence(rel, "./tapTables")).toBeNull();
    expect(offence(rel, "@lib/tapTables")).toBeNull();
    expect(offence(rel, "@/components/api")).toBeNull();
  });

  it("no island or pure module imports @/db, @/server, a *.server module or node:*", () => {
    const offences = pureFiles.flatMap((rel) =>
      specifiers(readFileSync(join(root, rel), "utf8")).flatMap((spec) => {
        const what = offence(rel, spec);
        return what ? [`${rel} imports ${spec} (${what})`] : [];
      }),
    );
    expect(offences).toEqual([]);
  });
});
