// A big Touchstone upload is derived in the engine worker, not on the web server's event loop: a
// health request sent while it derives is answered first. Order, not time, is asserted.
import { afterAll, expect, it } from "vitest";
import { backplaneTouchstone } from "@/features/demo/backplaneTouchstone";
import { baseUrl, signIn } from "../support/http";
import { BIT_RATE, NYQUIST_HZ } from "../fixtures/channelFiles";
import { closeDb, upload } from "../fixtures/workspace";

afterAll(closeDb);

it("a health request sent during a large .s4p preview is answered before the preview", async () => {
  const designer = await signIn("designer");
  // 20 000 frequency points of four ports: seconds of derivation on this machine.
  const big = backplaneTouchstone({
    model: { lossAtNyquist_dB: 18, delay_s: 1.5e-9 },
    nyquist_Hz: NYQUIST_HZ,
    step_Hz: 2e6,
    stop_Hz: 40e9,
    comments: ["large test lane"],
  });
  const order: string[] = [];
  const preview = upload(designer, "/api/v1/channels/preview", "big.s4p", big, {
    bitRate_bps: String(BIT_RATE),
    pairs: "1,2,3,4",
  }).then(async (r) => {
    order.push("preview");
    return r;
  });
  const health = fetch(`${baseUrl}/api/v1/health`).then((r) => {
    order.push("health");
    return r;
  });
  const [p, h] = await Promise.all([preview, health]);
  expect(h.status).toBe(200);
  expect(p.status, await p.clone().text()).toBe(200);
  expect((await p.json()).derivation.source).toBe("touchstone");
  expect(order).toEqual(["health", "preview"]);
});
