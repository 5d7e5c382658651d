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
    expect(error.fields.oneWayLengthM).toMatch(/oneWayLengthM/);
    expect(error.fields.systemVoltage).toMatch(/systemVoltage/);
    expect(Object.values(error.fields).join(" ")).toMatch(/loadWatts/);
  });

  it("refuses a body that is not JSON", async () => {
    expect((await post("loadWatts=10", "application/x-www-form-urlencoded")).status).toBe(415);
    expect((await post("{not json")).status).toBe(400);
  });
});
