// Pages answer 404 with one "not found" page for unknown addresses and for things that do not
// exist (or ids that are not ids), inside the shell for signed-in people.
import { describe, expect, it } from "vitest";
import { signIn } from "../support/http";

describe("not found", () => {
  it("detail pages of missing things answer 404 with the shared page", async () => {
    const designer = await signIn("designer");
    for (const path of [
      "/channels/999999",
      "/runs/abc",
      "/budgets/0",
      "/studies/999999",
      "/tables/999999",
      "/sign-off/999999",
      "/reports/tables/999999/1",
      "/no-such-page",
    ]) {
      const res = await designer.get(path);
      expect(res.status, path).toBe(404);
      const html = await res.text();
      expect(html, path).toContain("Nothing here");
      expect(html, path).toContain("Sign out");
    }
  });
});
