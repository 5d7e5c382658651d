import { beforeAll, describe, expect, it } from "vitest";

type Action = (args: { request: Request; params: Record<string, string>; context: unknown }) => Promise<Response>;
let action: Action;

beforeAll(async () => {
  action = (await import("~/routes/api.circuit")).action as unknown as Action;
});

const post = (body: unknown, type = "application/json") =>
  action({
    request: new Request("http://localhost/api/circuit", {
      method: "POST",
      headers: { "content-type": type },
      body: typeof body === "string" ? body : JSON.stringify(body),
    }),
    params: {},
    context: {},
  });

describe("POST /api/circuit", () => {
  it("answers the engine's shape for a valid circuit", async () => {
    // Derived by hand from engine.md §1 (not published): 110 W at 12 V → 9.167 A → 15 A fuse (NEC 210.20(A) 125 %,
    // ISO 8820-3 ratings); 3 % limit, 5 m one way, chassis return → 12 AWG with 0.239 V drop (ASTM B258, ρ = 1/58).
    const res = await post({ loadWatts: 110, oneWayLengthM: 5, returnPath: "chassis", wire: { awg: 12 }, fuseA: 15 });
    expect(res.status).toBe(200);
    const body = (await res.json()) as {
      currentA: number;
      recommendedFuseA: number;
      minWire: { awg: number; mm2: number };
      chosen: { ampacityA: number; dropV: number; dropPct: number };
      relayNeeded: boolean;
      findings: { rule: string }[];
      sources: unknown[];
    };
    expect(body.currentA).toBeCloseTo(110 / 12, 9);
    expect(body.recommendedFuseA).toBe(15);
    expect(body.minWire.awg).toBe(12);
    expect(body.chosen.dropV).toBeCloseTo(0.239, 3);
    expect(body.relayNeeded).toBe(false);
    expect(body.findings).toEqual([]);
    expect(body.sources.length).toBeGreaterThan(0);
  });

  it("names each bad field in a 400", async () => {
    const res = await post({ loadWatts: 100, loadAmps: 8, oneWayLengthM: 0, systemVoltage: 36 });
    expect(res.status).toBe(400);
    const { error } = (await res.json()) as { error: { code: string; fields: Record<string, string> } };
    expect(error.code).toBe("invalid");
    // Keyed by field name for the client; worded with the labels people see.
    expect(error.fields.oneWayLengthM).toBe("One-way run must be more than 0 m");
    expect(error.fields.systemVoltage).toBe("System voltage must be 12 or 24 V");
    expect(error.fields.loadWatts).toBe("Give the load as power (W) or as current (A), not both");
    for (const message of Object.values(error.fields))
      expect(message).not.toMatch(/oneWayLengthM|systemVoltage|loadWatts|loadAmps/);
  });

  it("reports no-fuse-fits and no-wire-fits for 3000 W over 8 m", async () => {
    // 3000 W / 12 V = 250 A; 125 % (NEC 210.20(A)) is 312.5 A, above the 100 A largest standard rating (ISO 8820-3, cartridges).
    const res = await post({ loadWatts: 3000, oneWayLengthM: 8 });
    expect(res.status).toBe(200);
    const body = (await res.json()) as {
      currentA: number;
      recommendedFuseA: number | null;
      findings: { rule: string; severity: string; message: string }[];
    };
    expect(body.currentA).toBe(250);
    expect(body.recommendedFuseA).toBeNull();
    const bySeverity = Object.fromEntries(body.findings.map((f) => [f.rule, f.severity]));
    expect(bySeverity).toMatchObject({ "no-fuse-fits": "blocking", "no-wire-fits": "blocking" });
    for (const f of body.findings) expect(f.message).not.toContain(f.rule);
  });

  it("reports switch-overloaded with no relay, relay-recommended while undecided", async () => {
    // common practice: 300 W / 12 V = 25 A through a 10 A switch needs a relay.
    const base = { loadWatts: 300, oneWayLengthM: 8, wire: { awg: 8 }, fuseA: 35, switchRatingA: 10, dropLimitPct: 10 };
    const without = (await (await post({ ...base, relay: false })).json()) as { findings: { rule: string; severity: string }[] };
    expect(without.findings).toEqual([expect.objectContaining({ rule: "switch-overloaded", severity: "blocking" })]);
    const undecided = (await (await post(base)).json()) as { findings: { rule: string; severity: string }[] };
    expect(undecided.findings).toEqual([expect.objectContaining({ rule: "relay-recommended", severity: "info" })]);
  });

  it("checks a switch feed branch against its own fuse", async () => {
    // 33 CFR 183.455(c)(1): 18 AWG in the engine bay carries 17 A (33 CFR 183.425), so at most 25.5 A of fuse.
    const lamps = { loadWatts: 170, oneWayLengthM: 2.6, returnPath: "chassis", wire: { awg: 12 }, fuseA: 20, relay: true };
    const tap = (await (await post({ ...lamps, switchFeed: { from: "tap", fuseA: 3, wire: { awg: 18 } } })).json()) as {
      findings: unknown[];
      switchFeed: { fuseA: number };
    };
    expect(tap.findings).toEqual([]);
    expect(tap.switchFeed.fuseA).toBe(3);
    const main = (await (
      await post({ ...lamps, fuseA: 30, wire: { awg: 10 }, switchFeed: { from: "main", wire: { awg: 18 } } })
    ).json()) as {
      findings: { rule: string }[];
    };
    expect(main.findings.map((f) => f.rule)).toContain("switch-feed-exceeds-wire");
    const bad = await post({ ...lamps, switchFeed: { from: "somewhere" } });
    expect(bad.status).toBe(400);
  });

  it("refuses a body that is not JSON", async () => {
    expect((await post("loadWatts=10", "application/x-www-form-urlencoded")).status).toBe(415);
    expect((await post("{not json")).status).toBe(400);
  });
});
