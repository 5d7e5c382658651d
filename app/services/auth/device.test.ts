import { describe, expect, it } from "vitest";
import { deviceCookie, knownDevice, rememberDevice } from "./device.server";

const production = {
  NODE_ENV: "production",
  APP_ORIGIN: "https://guides.example",
  SESSION_SECRET: "a-production-secret-value",
} as const;
const local = { NODE_ENV: "test", APP_ORIGIN: "http://localhost:3000", SESSION_SECRET: "a-test-secret-value-here" } as const;

/** A request carrying the cookie a Set-Cookie value sets (its name=value pair only, as a browser sends it). */
const carrying = (setCookie: string) => new Request("http://localhost/login", { headers: { cookie: setCookie.split(";")[0] } });

describe("the device cookie", () => {
  it("is HttpOnly and SameSite=Lax, and in production Secure with the __Host- prefix", async () => {
    // Cookie prefixes and attributes: RFC 6265bis (draft-ietf-httpbis-rfc6265bis) §4.1.3.2 for __Host-.
    const header = await rememberDevice(new Request("https://guides.example/login"), 7, production);
    expect(header).toMatch(/^__Host-tl_device=/);
    expect(header).toMatch(/; HttpOnly/i);
    expect(header).toMatch(/; SameSite=Lax/i);
    expect(header).toMatch(/; Secure/i);
    expect(header).toMatch(/; Path=\//);
    const plain = await rememberDevice(new Request("http://localhost/login"), 7, local);
    expect(plain).toMatch(/^tl_device=/);
    expect(plain).not.toMatch(/; Secure/i);
    expect(deviceCookie(local).name).toBe("tl_device");
  });

  it("is recognised for the account it was set for, and for no other", async () => {
    const header = await rememberDevice(new Request("http://localhost/login"), 7, local);
    const id = await knownDevice(carrying(header), 7, local);
    expect(id).toMatch(/^[\w-]{16,}$/);
    expect(await knownDevice(carrying(header), 8, local)).toBeNull();
    // Signed with another secret, or changed by hand, it is worth nothing.
    expect(await knownDevice(carrying(header), 7, { ...local, SESSION_SECRET: "some-other-secret-value" })).toBeNull();
    expect(await knownDevice(carrying(header.replace(/=(.)/, "=A$1")), 7, local)).toBeNull();
  });

  it("keeps its id across sign-ins and remembers a few accounts on one browser", async () => {
    let header = await rememberDevice(new Request("http://localhost/login"), 7, local);
    const first = await knownDevice(carrying(header), 7, local);
    header = await rememberDevice(carrying(header), 8, local);
    expect(await knownDevice(carrying(header), 7, local)).toBe(first);
    expect(await knownDevice(carrying(header), 8, local)).not.toBeNull();
    header = await rememberDevice(carrying(header), 7, local);
    expect(await knownDevice(carrying(header), 7, local)).toBe(first);
    for (let user = 20; user < 25; user++) header = await rememberDevice(carrying(header), user, local);
    // Five at most: the oldest ones are forgotten.
    expect(await knownDevice(carrying(header), 24, local)).not.toBeNull();
    expect(await knownDevice(carrying(header), 8, local)).toBeNull();
  });
});
