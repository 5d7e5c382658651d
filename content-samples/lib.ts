// Helpers for writing the demo guides concisely. They produce Tiptap
// StarterKit JSON (doc, paragraph, text with bold/italic marks, bulletList,
// orderedList, listItem, heading) and the sample-file shapes the seed loads.

export type Mark = { type: "bold" } | { type: "italic" };
export type TextNode = { type: "text"; text: string; marks?: Mark[] };
export type Inline = string | TextNode;
export type Paragraph = { type: "paragraph"; content?: TextNode[] };
export type Heading = {
  type: "heading";
  attrs: { level: 1 | 2 | 3 | 4 };
  content: TextNode[];
};
export type ListItem = { type: "listItem"; content: Paragraph[] };
export type BulletList = { type: "bulletList"; content: ListItem[] };
export type OrderedList = { type: "orderedList"; content: ListItem[] };
export type Block = Paragraph | Heading | BulletList | OrderedList;
export type Doc = { type: "doc"; content: Block[] };

function text(value: string, marks?: Mark[]): TextNode {
  if (value.length === 0) throw new Error("empty text node");
  return marks ? { type: "text", text: value, marks } : { type: "text", text: value };
}

function inlines(items: Inline[]): TextNode[] {
  // Tiptap rejects empty text nodes, so empty strings are dropped here.
  return items.filter((item) => item !== "").map((item) => (typeof item === "string" ? text(item) : item));
}

export const b = (value: string): TextNode => text(value, [{ type: "bold" }]);
export const i = (value: string): TextNode => text(value, [{ type: "italic" }]);

export function p(...items: Inline[]): Paragraph {
  const content = inlines(items);
  return content.length > 0 ? { type: "paragraph", content } : { type: "paragraph" };
}

export function h(level: 1 | 2 | 3 | 4, value: string): Heading {
  return { type: "heading", attrs: { level }, content: [text(value)] };
}

type Item = string | Inline[];
const item = (entry: Item): ListItem => ({
  type: "listItem",
  content: [typeof entry === "string" ? p(entry) : p(...entry)],
});

export const ul = (...items: Item[]): BulletList => ({ type: "bulletList", content: items.map(item) });
export const ol = (...items: Item[]): OrderedList => ({ type: "orderedList", content: items.map(item) });
export const doc = (...blocks: Block[]): Doc => ({ type: "doc", content: blocks });

// ---- Shapes of the sample files (mirrors the zod callout schema) ----

export type TorqueCallout = {
  kind: "torque";
  fastener: string;
  size?: "M6" | "M8" | "M10" | "M12";
  propertyClass?: "8.8" | "10.9";
  threadlocker?: string;
} & (
  | {
      value: number;
      unit: "N·m" | "lbf·ft" | "lbf·in";
      estimate?: never;
      /** Whose value it is: every demo torque records one. */
      valueSource: "vehicle-maker" | "accessory-maker" | "author-measured";
    }
  // Only where no maker value exists: the engine estimates from size and class.
  | {
      estimate: true;
      size: "M6" | "M8" | "M10" | "M12";
      propertyClass: "8.8" | "10.9";
      lubricated?: boolean;
      value?: never;
      valueSource: "estimate";
    }
);

type Load = { loadWatts: number; loadAmps?: never } | { loadAmps: number; loadWatts?: never };

export type CircuitCallout = {
  kind: "circuit";
  label?: string;
  systemVoltage: 12 | 24;
  continuous: boolean;
  oneWayLengthM: number;
  returnPath: "wire" | "chassis";
  location: "engine-bay" | "cabin";
  insulationC: 60 | 90 | 105 | 125;
  bundled: number;
  dropLimitPct: number;
  wire: { awg: number } | { mm2: number };
  fuseA: number | null;
  fuseDistanceMm?: number;
  switchRatingA: number;
  relay: boolean;
  feed: "battery" | "fuse-box";
  /** Where the switch and relay coil take their feed; absent = the main fused line on the main wire. */
  switchFeed?:
    | { from: "main"; wire?: { awg: number } | { mm2: number } }
    | { from: "tap"; fuseA: number; wire: { awg: number } | { mm2: number } };
} & Load;

export type CautionCallout = {
  kind: "caution";
  signalWord: "DANGER" | "WARNING" | "CAUTION" | "NOTICE";
  text: string;
};

export type TipCallout = { kind: "tip"; text: string };

export type Callout = TorqueCallout | CircuitCallout | CautionCallout | TipCallout;

export type PhotoSample = { file: string; alt: string; caption: string };

export type StepSample = {
  title: string;
  body: Doc;
  liftsVehicle: boolean;
  disconnectsBattery: boolean;
  photos: PhotoSample[];
  callouts: Callout[];
};

export type GuideSample = {
  slug: string;
  title: string;
  summary: string;
  category: "lighting" | "power" | "racks" | "protection" | "recovery" | "electronics";
  difficulty: 1 | 2 | 3 | 4 | 5;
  minutes: number;
  author: string;
  state: "published" | "in-review" | "draft";
  changeSummary: string;
  steps: StepSample[];
  fitment: { variant: string; status: "fits" | "fits-with-changes" | "does-not-fit"; note?: string }[];
  parts: { name: string; quantity: number; partNumber?: string; notes?: string; step: number }[];
  tools: { name: string }[];
};
