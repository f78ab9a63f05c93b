// When `npm start` seeds the demo workspace: on loopback by default, elsewhere only when asked,
// never in production.
import { describe, expect, it } from "vitest";
import { demoWanted } from "../../scripts/lib/demo.mjs";

describe("demoWanted", () => {
  it("seeds on a loopback HOST unless TAPWRIGHT_DEMO=0", () => {
    for (const HOST of [undefined, "127.0.0.1", "localhost", "::1", "127.0.1.1"])
      expect(demoWanted({ HOST }).seed, String(HOST)).toBe(true);
    expect(demoWanted({ HOST: "127.0.0.1", TAPWRIGHT_DEMO: "0" }).seed).toBe(false);
  });
  it("does not seed on a HOST others can reach unless TAPWRIGHT_DEMO=1, and says how", () => {
    for (const HOST of ["0.0.0.0", "::", "10.1.2.3", "tapwright.example"]) {
      const d = demoWanted({ HOST });
      expect(d.seed, HOST).toBe(false);
      expect(d.why).toMatch(/TAPWRIGHT_DEMO=1/);
    }
    expect(demoWanted({ HOST: "0.0.0.0", TAPWRIGHT_DEMO: "1" }).seed).toBe(true);
  });
  it("never seeds in production", () => {
    expect(demoWanted({ NODE_ENV: "production", HOST: "127.0.0.1", TAPWRIGHT_DEMO: "1" }).seed).toBe(false);
  });
});
