import { createRequire } from "node:module";
import { describe, expect, it } from "vitest";
import { chosenEncoding } from "./content-coding";

// The negotiator that compression@1.8 (the Express layer that compresses every other answer) uses,
// loaded from where compression loads it, with compression's own lists (its index.js).
const fromCompression = createRequire(createRequire(import.meta.url).resolve("compression"));
const Negotiator = fromCompression("negotiator") as new (request: {
  headers: Record<string, string>;
}) => {
  encoding(available: string[], preferred: string[]): string | undefined;
};
const compressionChoice = (header: string) =>
  new Negotiator({ headers: { "accept-encoding": header } }).encoding(["br", "gzip", "deflate", "identity"], ["br", "gzip"]);

describe("chosenEncoding", () => {
  // RFC 9110 §12.5.3, the examples of Accept-Encoding given there.
  it.each([
    ["compress, gzip", "gzip"],
    ["*", "br"],
    ["compress;q=0.5, gzip;q=1.0", "gzip"],
    ["gzip;q=1.0, identity; q=0.5, *;q=0", "gzip"],
  ])("RFC 9110 §12.5.3 example %j → %s", (header, expected) => {
    expect(chosenEncoding(header)).toBe(expected);
  });

  it("is the identity without the header (RFC 9110 §12.5.3: no preference) or when every coding is refused", () => {
    expect(chosenEncoding(undefined)).toBe("identity");
    expect(chosenEncoding("")).toBe("identity");
    expect(chosenEncoding("br;q=0, gzip;q=0, deflate;q=0")).toBe("identity");
    expect(chosenEncoding("identity")).toBe("identity");
  });

  it.each([
    "compress, gzip",
    "*",
    "gzip;q=1.0, identity; q=0.5, *;q=0",
    "br;q=0, gzip",
    "gzip;q=0.5, br;q=0.8",
    "gzip, deflate, br",
    "gzip, deflate, br, zstd",
    "gzip, deflate",
    "deflate",
    "GZIP",
    "gzip;q=0.001, *;q=0.5",
    "br;q=0, gzip;q=0, deflate;q=0",
  ])("chooses as the compression middleware does for %j", (header) => {
    expect(chosenEncoding(header)).toBe(compressionChoice(header));
  });
});
