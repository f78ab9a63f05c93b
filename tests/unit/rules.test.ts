// The public-path rule matches whole path segments (/_astro/… and /fonts/… are open, a page whose
// name merely starts the same way is not), and sign-in's next never leaves the site.
import { describe, expect, it } from "vitest";
import { ruleFor } from "@/server/auth/rules";
import { safeNextPath } from "@/server/http/pages";

describe("public paths", () => {
  it("assets and the icon are public", () => {
    for (const p of ["/_astro/client.js", "/fonts/inter.woff2", "/favicon.svg"])
      expect(ruleFor("GET", p).access, p).toBe("public");
  });
  it("paths that only start like them are not", () => {
    for (const p of ["/_astronaut", "/fontsecret", "/favicon-admin", "/favicons/x", "/_astro"])
      expect(ruleFor("GET", p).access, p).not.toBe("public");
  });
});

describe("sign-in's next", () => {
  const origin = "http://127.0.0.1:4321";
  it("keeps a path on this site with its query", () => {
    expect(safeNextPath("/runs/4?fields=status", origin)).toBe("/runs/4?fields=status");
  });
  it("drops what resolves to another origin: a backslash, two slashes, a tab, an absolute URL, a scheme", () => {
    for (const next of [
      "/\\evil.example",
      "/\\\\evil.example",
      "//evil.example",
      "/\t/evil.example",
      "https://evil.example/",
      "javascript:alert(1)",
      "",
      null,
    ]) {
      expect(safeNextPath(next, origin), String(next)).toBe("/");
    }
  });
});
