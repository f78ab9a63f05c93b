// A victim channel with its aggressors in one upload: pairs of a multi-port file, files of their
// own and the coupling model; their pulses and ICN come back with the channel, their own files byte
// for byte; aggressors that do not fit are refused and leave nothing behind.
import { createHash } from "node:crypto";
import { afterAll, describe, expect, it } from "vitest";
import { signIn } from "../support/http";
import { BIT_RATE, files } from "../fixtures/channelFiles";
import { closeDb, finished, rowCounts, unique, upload } from "../fixtures/workspace";

afterAll(closeDb);

const sha256 = (b: string | Uint8Array) => createHash("sha256").update(b).digest("hex");

interface Aggressor {
  position: number;
  name: string;
  kind: "next" | "fext";
  source: string;
  pulse: { values_V: number[]; mainIndex: number; samplesPerUi: number };
  coupling: { freqs_Hz: number[]; magnitude_dB: number[] } | null;
  icnRms_V: number;
  file: { filename: string; bytes: number; sha256: string } | null;
}

describe("a victim with its aggressors", () => {
  it("a 12-port file: the victim by its pairs and two neighbours' pairs as NEXT and FEXT, in one step", async () => {
    const designer = await signIn("designer");
    const body = files.s12p(18);
    const aggressors = [
      { source: "ports", kind: "next", p: 11, n: 12, name: "Lane 2, driven at the receiver's end" },
      { source: "ports", kind: "fext", p: 3, n: 4 },
    ];
    const res = await upload(designer, "/api/v1/channels", "bundle.s12p", body, {
      name: unique("Bundle victim"),
      bitRate_bps: String(BIT_RATE),
      pairs: "1,2,7,8",
      aggressors: JSON.stringify(aggressors),
    });
    expect(res.status, await res.clone().text()).toBe(201);
    const { id, sha256: sum } = await res.json();
    expect(sum).toBe(sha256(body));
    const detail = await (await designer.get(`/api/v1/channels/${id}`)).json();
    expect(detail.lossAtNyquist_dB).toBeCloseTo(18, 1);
    expect(detail.derivation).toMatchObject({
      transfer: "SDD21",
      ports: 12,
      pairs: { inP: 1, inN: 2, outP: 7, outN: 8 },
    });
    const list = detail.aggressors as Aggressor[];
    expect(list.map((a) => [a.position, a.name, a.kind, a.source])).toEqual([
      [0, "Lane 2, driven at the receiver's end", "next", "ports"],
      [1, "FEXT ports 3/4", "fext", "ports"],
    ]);
    for (const a of list) {
      expect(a.icnRms_V).toBeGreaterThan(1e-5);
      expect(a.icnRms_V).toBeLessThan(0.05);
      expect(a.pulse.samplesPerUi).toBe(32);
      expect(a.coupling!.freqs_Hz.length).toBe(a.coupling!.magnitude_dB.length);
      expect(a.file).toBeNull();
    }
    // The near-end coupling of lane 2 (K_b = 0.008) saturates at 2·K_b at most: 20·log10(0.016) ≈ −36 dB.
    expect(Math.max(...list[0].coupling!.magnitude_dB)).toBeLessThan(-35.5);
    const original = await designer.get(`/api/v1/channels/${id}/original`);
    expect(Buffer.from(new Uint8Array(await original.arrayBuffer())).equals(Buffer.from(body))).toBe(true);
  });

  it("separate files and the coupling model: a 2-port crosstalk path, a pulse CSV, a synthetic FEXT — originals kept", async () => {
    const designer = await signIn("designer");
    const path = files.s2p(40);
    const csv = files.pulseCsv();
    const aggressors = [
      { source: "file", kind: "next", field: "aggressor0", name: "Measured NEXT path" },
      { source: "file", kind: "fext", field: "aggressor1", csvKind: "pulse-csv" },
      { source: "coupling", kind: "fext", coupling: { forwardCoupling_s: 2e-12, lossAtNyquist_dB: 12, delay_s: 1e-9 } },
    ];
    const res = await upload(
      designer,
      "/api/v1/channels",
      "victim.s4p",
      files.s4p(12),
      { name: unique("Victim with files"), bitRate_bps: String(BIT_RATE), aggressors: JSON.stringify(aggressors) },
      { aggressor0: { filename: "next-path.s2p", body: path }, aggressor1: { filename: "fext-pulse.csv", body: csv } },
    );
    expect(res.status, await res.clone().text()).toBe(201);
    const { id } = await res.json();
    const list = (await (await designer.get(`/api/v1/channels/${id}`)).json()).aggressors as Aggressor[];
    expect(list.map((a) => [a.kind, a.source, a.file?.filename ?? null])).toEqual([
      ["next", "file", "next-path.s2p"],
      ["fext", "file", "fext-pulse.csv"],
      ["fext", "coupling", null],
    ]);
    expect(list[1].coupling).toBeNull(); // a time-domain record has no coupling curve
    for (const [i, body] of [
      [0, path],
      [1, csv],
    ] as const) {
      const r = await designer.get(`/api/v1/channels/${id}/aggressors/${i}/original`);
      expect(r.status).toBe(200);
      expect(Buffer.from(new Uint8Array(await r.arrayBuffer())).equals(Buffer.from(body))).toBe(true);
      expect(r.headers.get("x-content-sha256")).toBe(sha256(body));
    }
    expect((await designer.get(`/api/v1/channels/${id}/aggressors/2/original`)).status).toBe(404);
  });

  it("a synthetic channel takes coupling-model aggressors as JSON", async () => {
    const designer = await signIn("designer");
    const res = await designer.send("POST", "/api/v1/channels", {
      name: unique("Synthetic with NEXT"),
      bitRate_bps: BIT_RATE,
      lossModel: { lossAtNyquist_dB: 20, delay_s: 2e-9 },
      aggressors: [
        {
          source: "coupling",
          kind: "next",
          coupling: { backwardCoefficient: 0.015, lossAtNyquist_dB: 1, delay_s: 2e-10 },
        },
      ],
    });
    expect(res.status, await res.clone().text()).toBe(201);
    const list = (await (await designer.get(`/api/v1/channels/${(await res.json()).id}`)).json())
      .aggressors as Aggressor[];
    expect(list).toHaveLength(1);
    expect(list[0]).toMatchObject({ kind: "next", source: "coupling", name: "NEXT 1" });
  });

  it("a run of a victim with aggressors copies them and shows the eye with and without crosstalk, each aggressor and the packages' loss", async () => {
    const designer = await signIn("designer");
    const channel = await designer.send("POST", "/api/v1/channels", {
      name: unique("Victim for a run"),
      bitRate_bps: BIT_RATE,
      lossModel: { lossAtNyquist_dB: 16, delay_s: 2e-9 },
      aggressors: [
        {
          source: "coupling",
          kind: "next",
          name: "Lane 3 NEXT",
          coupling: { backwardCoefficient: 0.02, lossAtNyquist_dB: 1, delay_s: 2e-10 },
        },
        {
          source: "coupling",
          kind: "fext",
          name: "Lane 1 FEXT",
          coupling: { forwardCoupling_s: 3e-12, lossAtNyquist_dB: 16, delay_s: 2e-9 },
        },
      ],
    });
    expect(channel.status, await channel.clone().text()).toBe(201);
    const channelId = (await channel.json()).id;
    const budget = await designer.send("POST", "/api/v1/budgets", {
      name: unique("Budget with packages"),
      modulation: "nrz",
      txSwing_Vppd: 0.8,
      noiseRms_V: 0.0015,
      limiterSensitivity_V: 0.015,
      requiredHeadroom_V: 0.005,
      tx: { pre: 1, post: 1, step: 0.1 },
      ctle: { gDc_dB: [-8, 0, 4], fz_Hz: 7e9, fp1_Hz: 7e9, fp2_Hz: 28e9 },
      dfe: { taps: 2, limits_V: 0.1 },
      package: { tx: {}, rx: {} },
    });
    expect(budget.status, await budget.clone().text()).toBe(201);
    const start = await designer.send("POST", "/api/v1/runs", { channelId, budgetId: (await budget.json()).id });
    expect(start.status, await start.clone().text()).toBe(202);
    const { id } = await start.json();
    expect(await finished(designer, id, 120_000)).toMatchObject({ status: "done" });
    const run = await (await designer.get(`/api/v1/runs/${id}`)).json();
    expect(run.inputs.channel.aggressors.map((a: { name: string; kind: string }) => [a.name, a.kind])).toEqual([
      ["Lane 3 NEXT", "next"],
      ["Lane 1 FEXT", "fext"],
    ]);
    const x = run.result.crosstalk;
    expect(x.perAggressor.map((a: { name: string }) => a.name)).toEqual(["Lane 3 NEXT", "Lane 1 FEXT"]);
    expect(x.eyeHeightWithoutCrosstalk_V).toBeGreaterThan(run.result.metrics.eyeHeight_V);
    expect(x.eyeWithout.eyeHeight_V).toBeCloseTo(x.eyeHeightWithoutCrosstalk_V, 9);
    expect(run.result.loss.channelAtNyquist_dB).toBeCloseTo(16, 0);
    expect(run.result.loss.packageShare).toBeGreaterThan(0);
    const page = await (await designer.get(`/runs/${id}`)).text();
    for (const marker of [
      'data-testid="eye-without-crosstalk"',
      'data-testid="crosstalk-aggressors"',
      "Lane 1 FEXT",
      'data-testid="package-share"',
    ]) {
      expect(page).toContain(marker);
    }
  }, 150_000);

  it("the demo's Slot 9 lane comes with two neighbours from its 12-port file and closes only when their crosstalk is ignored", async () => {
    const designer = await signIn("designer");
    const found = await (await designer.get(`/api/v1/channels?q=${encodeURIComponent("Slot 9 lane 2")}`)).json();
    expect(found.items.length).toBeGreaterThan(0);
    const channelId = found.items[0].id;
    const detail = await (await designer.get(`/api/v1/channels/${channelId}`)).json();
    expect(detail.derivation).toMatchObject({ ports: 12 });
    expect((detail.aggressors as Aggressor[]).map((a) => [a.kind, a.source])).toEqual([
      ["next", "ports"],
      ["fext", "ports"],
    ]);
    const runs = await (await designer.get(`/api/v1/runs?channelId=${channelId}`)).json();
    expect(runs.items.length).toBeGreaterThan(0);
    const run = await (await designer.get(`/api/v1/runs/${runs.items[runs.items.length - 1].id}`)).json();
    const required = run.inputs.budget.params.requiredHeadroom_V;
    expect(run.result.metrics.limiterHeadroom_V).toBeLessThan(required);
    expect(run.result.crosstalk.limiterHeadroomWithoutCrosstalk_V).toBeGreaterThanOrEqual(required);
    expect(run.result.verdict.reasons.join(" ")).toMatch(/Crosstalk is what closes the eye/);
  });

  it("aggressors that do not fit are refused with a message naming them, and nothing is stored", async () => {
    const designer = await signIn("designer");
    const before = await rowCounts();
    const cases: {
      file: [string, string];
      aggressors: unknown;
      status: number;
      says: RegExp;
      more?: Record<string, { filename: string; body: string }>;
    }[] = [
      {
        file: ["lane.s4p", files.s4p(12)],
        aggressors: [{ source: "ports", kind: "next", p: 5, n: 6 }],
        status: 422,
        says: /multi-port Touchstone/,
      },
      {
        file: ["lane.s4p", files.s4p(12)],
        aggressors: [{ source: "file", kind: "next", field: "aggressor3" }],
        status: 400,
        says: /no file came/,
      },
      { file: ["lane.s4p", files.s4p(12)], aggressors: "not json", status: 400, says: /JSON array/ },
      {
        file: ["lane.s4p", files.s4p(12)],
        aggressors: [{ source: "coupling", kind: "next", coupling: { lossAtNyquist_dB: 1 } }],
        status: 400,
        says: /backwardCoefficient/,
      },
      {
        file: ["bundle.s12p", files.s12p(18)],
        aggressors: [{ source: "ports", kind: "next", p: 7, n: 8 }],
        status: 422,
        says: /port 7 appears in more than one pair/,
      },
      {
        file: ["bundle.s12p", files.s12p(18)],
        aggressors: [{ source: "ports", kind: "fext", p: 13, n: 14 }],
        status: 422,
        says: /port 1…12/,
      },
      {
        file: ["lane.s4p", files.s4p(12)],
        aggressors: [{ source: "file", kind: "fext", field: "aggressor0" }],
        more: { aggressor0: { filename: "broken.s2p", body: "# GHz S RI R 50\n1 0 0 0.5\n" } },
        status: 422,
        says: /broken\.s2p/,
      },
    ];
    for (const c of cases) {
      const res = await upload(
        designer,
        "/api/v1/channels",
        c.file[0],
        c.file[1],
        {
          name: unique("Refused"),
          bitRate_bps: String(BIT_RATE),
          aggressors: typeof c.aggressors === "string" ? c.aggressors : JSON.stringify(c.aggressors),
        },
        c.more,
      );
      const text = await res.text();
      expect(res.status, text).toBe(c.status);
      expect(JSON.parse(text).error.message).toMatch(c.says);
    }
    expect(await rowCounts()).toEqual(before);
  });

  it("the preview derives the aggressors without storing them", async () => {
    const designer = await signIn("designer");
    const before = await rowCounts();
    const res = await upload(designer, "/api/v1/channels/preview", "bundle.s12p", files.s12p(18), {
      bitRate_bps: String(BIT_RATE),
      aggressors: JSON.stringify([{ source: "ports", kind: "next", p: 11, n: 12 }]),
    });
    expect(res.status, await res.clone().text()).toBe(200);
    const preview = await res.json();
    expect(preview.aggressors).toHaveLength(1);
    expect(preview.derivation.pairs).toEqual({ inP: 1, inN: 2, outP: 7, outN: 8 }); // the default pairing of a 12-port file
    expect(await rowCounts()).toEqual(before);
  });
});
