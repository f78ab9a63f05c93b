// Channels through the API against MariaDB: every accepted format becomes a channel with a pulse;
// the original comes back byte for byte; malformed files are refused with a message naming the
// problem and leave no rows behind; the preview stores nothing; the role matrix on every route.
import { createHash } from "node:crypto";
import { afterAll, describe, expect, it } from "vitest";
import { anonymous, signIn, type DemoRole } from "../support/http";
import { BIT_RATE, badFiles, files } from "../fixtures/channelFiles";
import { closeDb, rowCounts, unique, upload } from "../fixtures/workspace";

afterAll(closeDb);

const sha256 = (b: string | Uint8Array) => createHash("sha256").update(b).digest("hex");
const accepted = [
  { filename: "lane.csv", body: files.pulseCsv, kind: "pulse-csv", fields: { kind: "pulse-csv" } },
  { filename: "lane-step.csv", body: files.stepCsv, kind: "step-csv", fields: { kind: "step-csv" } },
  { filename: "lane-impulse.txt", body: files.impulseCsv, kind: "impulse-csv", fields: { kind: "impulse-csv" } },
  { filename: "lane.s2p", body: () => files.s2p(12), kind: "touchstone", fields: {} },
  { filename: "lane.s4p", body: () => files.s4p(18), kind: "touchstone", fields: { pairs: "1,2,3,4" } },
] as const;

describe("uploading channels", () => {
  for (const f of accepted) {
    it(`${f.filename} (${f.kind}) → a channel with a pulse, and the original byte for byte`, async () => {
      const designer = await signIn("designer");
      const name = unique(`Upload ${f.filename}`);
      const body = f.body();
      const res = await upload(designer, "/api/v1/channels", f.filename, body, {
        name,
        bitRate_bps: String(BIT_RATE),
        ...f.fields,
      });
      expect(res.status, await res.clone().text()).toBe(201);
      const created = await res.json();
      expect(created).toMatchObject({ name, kind: f.kind, bitRate_bps: BIT_RATE, sha256: sha256(body) });

      const detail = await (await designer.get(`/api/v1/channels/${created.id}`)).json();
      expect(detail.pulse.ui_s).toBeCloseTo(1 / BIT_RATE, 20);
      expect(detail.pulse.samplesPerUi).toBe(32);
      expect(detail.pulse.values_V.length).toBeGreaterThan(64);
      expect(detail.pulse.values_V[detail.pulse.mainIndex]).toBeCloseTo(detail.mainCursor_V, 12);
      expect(detail.source).toEqual({
        filename: f.filename,
        contentType: expect.any(String),
        bytes: Buffer.byteLength(body),
        sha256: sha256(body),
      });

      const original = await designer.get(`/api/v1/channels/${created.id}/original`);
      expect(original.status).toBe(200);
      const bytes = new Uint8Array(await original.arrayBuffer());
      expect(Buffer.from(bytes).equals(Buffer.from(body))).toBe(true);
      expect(original.headers.get("x-content-sha256")).toBe(sha256(body));
      expect(original.headers.get("content-disposition")).toContain(f.filename);
    });
  }

  it("a Touchstone channel knows its insertion loss at Nyquist (the file's line has 12 dB there)", async () => {
    const designer = await signIn("designer");
    const res = await upload(designer, "/api/v1/channels", "twelve.s2p", files.s2p(12), {
      name: unique("Twelve"),
      bitRate_bps: "28e9",
    });
    const { id } = await res.json();
    const detail = await (await designer.get(`/api/v1/channels/${id}`)).json();
    expect(detail.lossAtNyquist_dB).toBeCloseTo(12, 1);
    expect(detail.insertionLoss.freqs_Hz.length).toBe(detail.insertionLoss.magnitude_dB.length);
    expect(detail.derivation).toMatchObject({ transfer: "S21", ports: 2, modulation: "nrz" });
  });

  it("a 4-port file's pairing decides SDD21: the preview shows it and stores nothing", async () => {
    const designer = await signIn("designer");
    const before = await rowCounts();
    const through = await upload(designer, "/api/v1/channels/preview", "lane.s4p", files.s4p(18), {
      bitRate_bps: "28e9",
      pairs: "1,2,3,4",
    });
    expect(through.status).toBe(200);
    const a = await through.json();
    expect(a.lossAtNyquist_dB).toBeCloseTo(18.18, 1); // (1 − 0.02 coupling)·H: 0.18 dB more than the line
    expect(a.derivation).toMatchObject({ transfer: "SDD21", pairs: { inP: 1, inN: 2, outP: 3, outN: 4 } });
    const crossed = await upload(designer, "/api/v1/channels/preview", "lane.s4p", files.s4p(18), {
      bitRate_bps: "28e9",
      pairs: '{"inP":1,"inN":3,"outP":2,"outN":4}',
    });
    expect(crossed.status).toBe(200);
    expect((await crossed.json()).lossAtNyquist_dB).toBeGreaterThan(40);
    const same = await upload(designer, "/api/v1/channels/preview", "lane.s4p", files.s4p(18), {
      bitRate_bps: "28e9",
      pairs: "1,1,3,4",
    });
    expect(same.status).toBe(400);
    expect((await same.json()).error.message).toMatch(/must be different/);
    expect(await rowCounts()).toEqual(before);
  });

  it("a PAM4 channel is built on the symbol's unit interval (two bits per symbol)", async () => {
    const designer = await signIn("designer");
    const res = await designer.send("POST", "/api/v1/channels", {
      name: unique("PAM4 line"),
      bitRate_bps: 106.25e9,
      modulation: "pam4",
      lossModel: { lossAtNyquist_dB: 10 },
    });
    expect(res.status).toBe(201);
    const detail = await (await designer.get(`/api/v1/channels/${(await res.json()).id}`)).json();
    expect(detail.pulse.ui_s).toBeCloseTo(2 / 106.25e9, 20);
    expect(detail.modulation).toBe("pam4");
    expect(detail.lossAtNyquist_dB).toBeCloseTo(10, 1);
  });
});

describe("synthetic channels", () => {
  it("a loss at Nyquist (JSON) → a channel without an original file", async () => {
    const designer = await signIn("designer");
    const res = await designer.send("POST", "/api/v1/channels", {
      name: unique("Synthetic"),
      bitRate_bps: 28e9,
      lossModel: { lossAtNyquist_dB: 24, delay_s: 1e-9 },
    });
    expect(res.status).toBe(201);
    const { id } = await res.json();
    const detail = await (await designer.get(`/api/v1/channels/${id}`)).json();
    expect(detail).toMatchObject({
      kind: "synthetic",
      source: null,
      derivation: { lossModel: { lossAtNyquist_dB: 24 } },
    });
    expect(detail.lossAtNyquist_dB).toBeCloseTo(24, 1);
    expect((await designer.get(`/api/v1/channels/${id}/original`)).status).toBe(404);
  });

  it("refuses impossible models with the field at fault", async () => {
    const designer = await signIn("designer");
    const before = await rowCounts();
    for (const [body, path] of [
      [{ name: "x", bitRate_bps: 28e9, lossModel: { lossAtNyquist_dB: 500 } }, "lossModel.lossAtNyquist_dB"],
      [{ name: "x", bitRate_bps: -1, lossModel: { lossAtNyquist_dB: 20 } }, "bitRate_bps"],
      [{ name: "", bitRate_bps: 28e9, lossModel: { lossAtNyquist_dB: 20 } }, "name"],
      [{ name: "x", bitRate_bps: 28e9 }, "lossModel"],
    ] as const) {
      const res = await designer.send("POST", "/api/v1/channels", body);
      expect(res.status).toBe(400);
      expect((await res.json()).error.path).toBe(path);
    }
    expect(await rowCounts()).toEqual(before);
  });
});

describe("malformed uploads", () => {
  for (const bad of badFiles) {
    it(`${bad.what} → ${bad.status} with a message, nothing stored`, async () => {
      const designer = await signIn("designer");
      const before = await rowCounts();
      const res = await upload(designer, "/api/v1/channels", bad.filename, bad.body(), {
        name: unique(bad.what),
        bitRate_bps: "28e9",
      });
      expect(res.status).toBe(bad.status);
      const { error } = await res.json();
      expect(error.message).toMatch(bad.says);
      expect(await rowCounts()).toEqual(before);
    });
  }

  it("a file over 50 MiB → 413 with the limit in the message, nothing stored", async () => {
    const designer = await signIn("designer");
    const before = await rowCounts();
    const big = new Uint8Array(50 * 1024 * 1024 + 10).fill(0x31);
    const res = await upload(designer, "/api/v1/channels", "huge.csv", big, { name: "huge", bitRate_bps: "28e9" });
    expect(res.status).toBe(413);
    expect((await res.json()).error.message).toMatch(/50\.0 MiB/);
    expect(await rowCounts()).toEqual(before);
  });

  it("a body that is neither multipart nor JSON → 415; a missing file → 400", async () => {
    const designer = await signIn("designer");
    const text = await designer.fetch("/api/v1/channels", {
      method: "POST",
      headers: { "content-type": "text/plain" },
      body: "1,2",
    });
    expect(text.status).toBe(415);
    const form = new FormData();
    form.set("name", "no file");
    form.set("bitRate_bps", "28e9");
    const none = await designer.fetch("/api/v1/channels", { method: "POST", body: form });
    expect(none.status).toBe(400);
    expect((await none.json()).error.path).toBe("file");
  });

  it("the bit rate and the CSV kind are checked (400 naming the field)", async () => {
    const designer = await signIn("designer");
    const noRate = await upload(designer, "/api/v1/channels", "a.csv", files.pulseCsv(), { name: "a" });
    expect(noRate.status).toBe(400);
    expect((await noRate.json()).error.path).toBe("bitRate_bps");
    const badKind = await upload(designer, "/api/v1/channels", "a.csv", files.pulseCsv(), {
      name: "a",
      bitRate_bps: "28e9",
      kind: "eye-diagram",
    });
    expect(badKind.status).toBe(400);
    expect((await badKind.json()).error.path).toBe("kind");
    const tsKind = await upload(designer, "/api/v1/channels", "a.s2p", files.s2p(), {
      name: "a",
      bitRate_bps: "28e9",
      kind: "step-csv",
    });
    expect(tsKind.status).toBe(415);
  });
});

describe("the channel list", () => {
  it("sorts, filters by name and kind, and pages with a cursor", async () => {
    const designer = await signIn("designer");
    const tag = unique("Sortable");
    for (const loss of [30, 10, 20]) {
      await designer.send("POST", "/api/v1/channels", {
        name: `${tag} ${loss} dB`,
        bitRate_bps: 28e9,
        lossModel: { lossAtNyquist_dB: loss },
      });
    }
    const q = encodeURIComponent(tag);
    const asc = await (await designer.get(`/api/v1/channels?q=${q}&sort=loss&dir=asc`)).json();
    expect(asc.items.map((c: { lossAtNyquist_dB: number }) => Math.round(c.lossAtNyquist_dB))).toEqual([10, 20, 30]);
    const byName = await (await designer.get(`/api/v1/channels?q=${q}&sort=name&dir=desc`)).json();
    expect(byName.items.map((c: { name: string }) => c.name)).toEqual([`${tag} 30 dB`, `${tag} 20 dB`, `${tag} 10 dB`]);
    const page1 = await (await designer.get(`/api/v1/channels?q=${q}&sort=loss&dir=asc&limit=2`)).json();
    expect(page1.items).toHaveLength(2);
    expect(page1.nextCursor).toBeTruthy();
    const page2 = await (
      await designer.get(`/api/v1/channels?q=${q}&sort=loss&dir=asc&limit=2&cursor=${page1.nextCursor}`)
    ).json();
    expect(page2.items).toHaveLength(1);
    expect(page2.nextCursor).toBeNull();
    const touchstone = await (await designer.get(`/api/v1/channels?q=${q}&kind=touchstone`)).json();
    expect(touchstone.items).toEqual([]);
    expect(asc.items[0]).toMatchObject({ kind: "synthetic", createdBy: "Tomas Ekwueme", modulation: "nrz" });
    const bad = await designer.get("/api/v1/channels?sort=colour");
    expect(bad.status).toBe(400);
  });
});

describe("deleting a channel", () => {
  it("removes it and its original file; an unknown channel is 404", async () => {
    const designer = await signIn("designer");
    const res = await upload(designer, "/api/v1/channels", "gone.csv", files.pulseCsv(), {
      name: unique("Gone"),
      bitRate_bps: "28e9",
    });
    const { id } = await res.json();
    const before = await rowCounts();
    const del = await designer.send("DELETE", `/api/v1/channels/${id}`);
    expect(del.status).toBe(200);
    const after = await rowCounts();
    expect(after.channels).toBe(before.channels - 1);
    expect(after.channel_sources).toBe(before.channel_sources - 1);
    expect((await designer.get(`/api/v1/channels/${id}`)).status).toBe(404);
    expect((await designer.send("DELETE", `/api/v1/channels/${id}`)).status).toBe(404);
  });
});

describe("roles on the channel routes", () => {
  const ROLES: DemoRole[] = ["admin", "designer", "firmware", "reviewer"];
  const writes = (role: DemoRole) => role === "admin" || role === "designer";

  it("everyone reads; only designers and admins upload, preview and delete; nobody anonymous", async () => {
    const designer = await signIn("designer");
    const made = await (
      await upload(designer, "/api/v1/channels", "roles.csv", files.pulseCsv(), {
        name: unique("Roles"),
        bitRate_bps: "28e9",
      })
    ).json();
    for (const role of ROLES) {
      const c = await signIn(role);
      for (const path of ["/api/v1/channels", `/api/v1/channels/${made.id}`, `/api/v1/channels/${made.id}/original`]) {
        expect((await c.get(path)).status, `${role} GET ${path}`).toBe(200);
      }
      const post = await c.send("POST", "/api/v1/channels", {
        name: unique(`By ${role}`),
        bitRate_bps: 28e9,
        lossModel: { lossAtNyquist_dB: 8 },
      });
      expect(post.status, `${role} POST`).toBe(writes(role) ? 201 : 403);
      const preview = await upload(c, "/api/v1/channels/preview", "p.csv", files.pulseCsv(), { bitRate_bps: "28e9" });
      expect(preview.status, `${role} preview`).toBe(writes(role) ? 200 : 403);
      const target = writes(role) ? (await post.json()).id : made.id;
      const del = await c.send("DELETE", `/api/v1/channels/${target}`);
      expect(del.status, `${role} DELETE`).toBe(writes(role) ? 200 : 403);
    }
    for (const [method, path] of [
      ["GET", "/api/v1/channels"],
      ["POST", "/api/v1/channels"],
      ["POST", "/api/v1/channels/preview"],
      ["GET", `/api/v1/channels/${made.id}`],
      ["DELETE", `/api/v1/channels/${made.id}`],
      ["GET", `/api/v1/channels/${made.id}/original`],
    ]) {
      expect((await anonymous().send(method, path)).status, `anonymous ${method} ${path}`).toBe(401);
    }
  });

  it("an API token reads channels and their files but cannot upload", async () => {
    const firmware = await signIn("firmware");
    const { secret } = await (await firmware.send("POST", "/api/v1/tokens", { name: unique("channel reader") })).json();
    const bearer = (path: string, init: RequestInit = {}) =>
      fetch(`${process.env.TAPWRIGHT_BASE_URL ?? "http://127.0.0.1:4399"}${path}`, {
        ...init,
        headers: { ...(init.headers ?? {}), authorization: `Bearer ${secret}` },
      });
    const list = await bearer("/api/v1/channels");
    expect(list.status).toBe(200);
    const write = await bearer("/api/v1/channels", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ name: "t", bitRate_bps: 28e9, lossModel: { lossAtNyquist_dB: 5 } }),
    });
    expect(write.status).toBe(401);
  });
});

describe("input checks of Touchstone files", () => {
  it("the preview and the stored channel judge a file that gains 8 % and stops at 20 GHz; a clean file passes; a CSV is not judged", async () => {
    const designer = await signIn("designer");
    const preview = await upload(designer, "/api/v1/channels/preview", "hot.s2p", files.hotShortS2p(), {
      bitRate_bps: String(BIT_RATE),
    });
    expect(preview.status, await preview.clone().text()).toBe(200);
    const q = (await preview.json()).quality;
    expect(q).toMatchObject({ passive: false, reciprocal: true, causal: true, dcPoint: "extrapolated" });
    expect(q.maxSingularValue).toBeCloseTo(1.08, 9);
    expect(q.bandCoverage.baudRatio).toBeCloseTo(20e9 / BIT_RATE, 12);
    expect(q.warnings.map((w: { code: string }) => w.code)).toEqual(["not-passive", "band-below-baud"]);
    expect(q.warnings[1].message).toMatch(
      /0\.71× the baud rate: the pulse is band-limited by the file, not the channel/,
    );

    const res = await upload(designer, "/api/v1/channels", "hot.s2p", files.hotShortS2p(), {
      name: unique("Hot lane"),
      bitRate_bps: String(BIT_RATE),
    });
    const { id } = await res.json();
    const detail = await (await designer.get(`/api/v1/channels/${id}`)).json();
    expect(detail.quality).toEqual(q);

    const clean = await (
      await upload(designer, "/api/v1/channels/preview", "lane.s4p", files.s4p(18), {
        bitRate_bps: String(BIT_RATE),
        pairs: "1,2,3,4",
      })
    ).json();
    expect(clean.quality).toMatchObject({ passive: true, reciprocal: true, causal: true, warnings: [] });
    expect(clean.quality.maxSingularValue).toBeLessThanOrEqual(1 + 1e-6);
    const csv = await (
      await upload(designer, "/api/v1/channels/preview", "lane.csv", files.pulseCsv(), {
        bitRate_bps: String(BIT_RATE),
        kind: "pulse-csv",
      })
    ).json();
    expect(csv.quality).toBeNull();
  });
});
