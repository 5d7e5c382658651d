import { describe, expect, it } from "vitest";
import { addressBucket } from "./rate-limit.server";

// Address text forms from RFC 4291 §2.2 (IPv6, "::" compression, IPv4-mapped ::ffff:a.b.c.d) and
// RFC 5952 (lower-case hex, leading zeros dropped). Counting IPv6 clients by /64 is common practice:
// RFC 6177 recommends end sites get at least a /64 each, so one client may hold all of it.
describe("addressBucket", () => {
  it.each([
    ["127.0.0.2", "127.0.0.2"],
    ["::ffff:127.0.0.2", "127.0.0.2"],
    ["2001:db8:1:2:aaaa:bbbb:cccc:dddd", "2001:db8:1:2::/64"],
    ["2001:DB8:1:2::1", "2001:db8:1:2::/64"],
    ["2001:0db8:0001:0002:ffff::9", "2001:db8:1:2::/64"],
    ["2001:db8::1", "2001:db8:0:0::/64"],
    ["::1", "0:0:0:0::/64"],
  ])("%s counts as %s", (address, bucket) => {
    expect(addressBucket(address)).toBe(bucket);
  });

  it("puts two addresses of one /64 together and of two /64s apart", () => {
    expect(addressBucket("2001:db8:1:2::a")).toBe(addressBucket("2001:db8:1:2:ffff:ffff:ffff:ffff"));
    expect(addressBucket("2001:db8:1:2::a")).not.toBe(addressBucket("2001:db8:1:3::a"));
  });
});
