/**
 * Every constant the engine uses points at one of these entries, so a reader
 * or an editor can see where a number comes from. Results carry ids; the
 * titles are for display.
 */
export const SOURCES = {
  "nist-sp-811": {
    title: "NIST Special Publication 811 (2008), Appendix B",
    detail: "Conversion factors: 1 lbf·ft = 1.355818 N·m, 1 lbf·in = 0.1129848 N·m, 1 kgf·m = 9.80665 N·m.",
  },
  "astm-b258": {
    title: "ASTM B258, nominal diameters of American Wire Gauge sizes",
    detail: "d = 0.127 mm × 92^((36 − n)/39) for gauge n.",
  },
  iacs: {
    title: "International Annealed Copper Standard (IACS)",
    detail: "Annealed copper resistivity 1/58 Ω·mm²/m at 20 °C; temperature coefficient 0.00393 per °C.",
  },
  "iec-60228": {
    title: "IEC 60228, class 5 (flexible) conductors",
    detail: "Maximum conductor resistance at 20 °C per nominal cross-section.",
  },
  "cfr-183-425": {
    title: "33 CFR 183.425, Table 5 and engine-room factor",
    detail:
      "Allowable amperage of single conductors at 30 °C ambient by insulation rating; × 0.85 for 105 °C insulation in an engine space.",
  },
  "cfr-183-455": {
    title: "33 CFR 183.455, overcurrent protection",
    detail: "(b) protection within 7 in (178 mm) of the source; (c)(1) rating not above 150 % of the conductor's ampacity.",
  },
  "nec-210-20a": {
    title: "NEC 210.20(A), continuous and non-continuous loads",
    detail: "Overcurrent device rated at least 125 % of the continuous load.",
  },
  "iso-8820-3": {
    title: "ISO 8820-3, road vehicles fuse-links with tabs (blade type)",
    detail: "Standard ratings 1 … 40 A; larger cartridge types 50 … 100 A.",
  },
  "iso-898-1": {
    title: "ISO 898-1, mechanical properties of carbon and alloy steel fasteners",
    detail: "Proof loads for coarse-thread bolts by property class.",
  },
  "din-72552": {
    title: "DIN 72552, terminal designations in motor vehicles",
    detail: "Relay terminals: 30 supply, 87 load, 85 and 86 coil.",
  },
  "ansi-z535-6": {
    title: "ANSI Z535.6, product safety information in manuals",
    detail: "Signal words DANGER, WARNING, CAUTION, NOTICE.",
  },
  "review-policy": {
    title: "Torqueleaf review policy",
    detail: "Every caution needs an editor's sign-off before a revision can be approved.",
  },
  "common-practice": {
    title: "Common practice",
    detail: "A fact of the trade without a single published source.",
  },
  "from-memory": {
    title: "From memory",
    detail: "A value recalled from published tables, not checked against the document here; treat as indicative.",
  },
} as const satisfies Record<string, { title: string; detail: string }>;

export type SourceId = keyof typeof SOURCES;

export type SourceRef = { id: SourceId; title: string; detail: string };

export function sourceRef(id: SourceId): SourceRef {
  return { id, ...SOURCES[id] };
}

/** Keeps the order of first use so the list reads like the explanation. */
export function sourceRefs(ids: Iterable<SourceId>): SourceRef[] {
  return [...new Set(ids)].map(sourceRef);
}
