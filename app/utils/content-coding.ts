/** The content codings the server compresses with (RFC 9110 §8.4.1; br: RFC 7932). */
export type ContentCoding = "br" | "gzip" | "deflate";

/**
 * The content coding for an Accept-Encoding header (RFC 9110 §12.5.3): the highest weight among
 * br, gzip and deflate, ties going to br, then gzip; "*" stands for any not named; no header, or
 * nothing acceptable, is the identity.
 */
export function chosenEncoding(header: string | undefined): ContentCoding | "identity" {
  if (!header) return "identity";
  const weights = new Map<string, number>();
  for (const part of header.split(",")) {
    const [name = "", ...params] = part.trim().toLowerCase().split(";");
    const q = params.map((p) => /^\s*q=([\d.]+)\s*$/.exec(p)?.[1]).find((v) => v !== undefined);
    const weight = q === undefined ? 1 : Number(q);
    if (name && Number.isFinite(weight)) weights.set(name.trim(), weight);
  }
  let best: ContentCoding | "identity" = "identity";
  let bestWeight = 0;
  for (const coding of ["br", "gzip", "deflate"] as const) {
    const weight = weights.get(coding) ?? weights.get("*") ?? 0;
    if (weight > bestWeight) {
      best = coding;
      bestWeight = weight;
    }
  }
  return best;
}
