import type { CircuitInput } from "./circuit-input";
import type { CircuitResult } from "./circuit";
import { escapeXml, hashId, num } from "./format";
import { wireLabel } from "./wire";

export type DiagramInput = CircuitInput & { relay?: boolean; label?: string };

/** A fuse drawn as a box with its strip, centred on (cx, y). */
function fuseBox(cx: number, y: number): string {
  return `<rect class="tl-part" x="${cx - 24}" y="${y - 8}" width="48" height="16" rx="3"/>${line(cx - 20, y, cx + 20, y, "tl-part")}`;
}

const WIDTH = 640;
const HEIGHT = 280;
/** The supply rail; everything carrying load current sits on it. */
const RAIL = 70;
/** The coil side of the relay and the switch sit on this line. */
const COIL = 160;
const RETURN = 250;

/** The diagram's own style sheet; the Content-Security-Policy allows exactly this text by its hash. */
export const DIAGRAM_STYLE =
  ".tl-diagram .tl-heading{font-size:13px;font-weight:600}.tl-diagram .tl-terminal{font-weight:600}.tl-diagram .tl-note{font-size:10px;opacity:.8}.tl-diagram .tl-link{stroke-width:1}";

function line(x1: number, y1: number, x2: number, y2: number, cls = "tl-wire"): string {
  return `<line class="${cls}" x1="${x1}" y1="${y1}" x2="${x2}" y2="${y2}"/>`;
}

function text(x: number, y: number, content: string, cls = "tl-label", anchor: "start" | "middle" | "end" = "middle"): string {
  return `<text class="${cls}" x="${x}" y="${y}" text-anchor="${anchor}" fill="currentColor" stroke="none">${escapeXml(content)}</text>`;
}

function dot(x: number, y: number): string {
  return `<circle class="tl-junction" cx="${x}" cy="${y}" r="3" fill="currentColor" stroke="none"/>`;
}

/** Chassis ground: a bar with three short strokes below it, drawn downward from (x, y). */
function chassisGround(x: number, y: number): string {
  return [
    line(x - 10, y, x + 10, y, "tl-ground"),
    line(x - 8, y, x - 12, y + 7, "tl-ground"),
    line(x, y, x - 4, y + 7, "tl-ground"),
    line(x + 8, y, x + 4, y + 7, "tl-ground"),
  ].join("");
}

/** A single-pole switch between x1 and x2 on height y. */
function inlineSwitch(x1: number, x2: number, y: number): string {
  return [
    `<circle class="tl-part" cx="${x1 + 3}" cy="${y}" r="3"/>`,
    line(x1 + 5, y - 1, x2 - 6, y - 12, "tl-part"),
    `<circle class="tl-part" cx="${x2 - 3}" cy="${y}" r="3"/>`,
    text((x1 + x2) / 2, y + 20, "SWITCH"),
  ].join("");
}

function fuseSymbol(input: DiagramInput, result: CircuitResult): { svg: string; words: string } {
  const box = (cls: string) =>
    `<rect class="${cls}" x="150" y="${RAIL - 8}" width="48" height="16" rx="3"${cls.includes("tl-alert") ? ' stroke-dasharray="4 3"' : ""}/>`;
  if (input.fuseA === null) {
    return {
      svg: box("tl-part tl-alert") + text(174, RAIL + 26, "NO FUSE", "tl-label tl-alert"),
      words: "no fuse (a fuse is required)",
    };
  }
  const strip = line(154, RAIL, 194, RAIL, "tl-part");
  if (typeof input.fuseA === "number") {
    const rating = `${num(input.fuseA)} A`;
    return { svg: box("tl-part") + strip + text(174, RAIL + 26, `${rating} fuse`), words: `a ${rating} fuse` };
  }
  const rating = result.recommendedFuseA === null ? "no standard fuse fits" : `${result.recommendedFuseA} A fuse`;
  return {
    svg: box("tl-part") + strip + text(174, RAIL + 26, rating) + text(174, RAIL + 38, "recommended", "tl-note"),
    words: `a fuse (recommended ${rating})`,
  };
}

function relaySymbol(): string {
  const left = 330;
  const right = 430;
  return [
    `<rect class="tl-part" x="${left}" y="50" width="${right - left}" height="130" rx="4"/>`,
    text(380, 196, "RELAY"),
    // Contact: 30 on the left, 87 on the right, drawn open.
    line(left, RAIL, 360, RAIL, "tl-part"),
    line(360, RAIL, 396, RAIL - 12, "tl-part"),
    line(400, RAIL, right, RAIL, "tl-part"),
    // Coil between 86 and 85, linked to the contact it moves.
    line(left, COIL, 365, COIL, "tl-part"),
    `<rect class="tl-part" x="365" y="${COIL - 10}" width="30" height="20"/>`,
    line(395, COIL, right, COIL, "tl-part"),
    `<line class="tl-link" x1="380" y1="${COIL - 10}" x2="380" y2="${RAIL - 4}" stroke-dasharray="3 3"/>`,
    text(left + 6, RAIL - 6, "30", "tl-terminal", "start"),
    text(right - 6, RAIL - 6, "87", "tl-terminal", "end"),
    text(left + 6, COIL - 6, "86", "tl-terminal", "start"),
    text(right - 6, COIL - 6, "85", "tl-terminal", "end"),
  ].join("");
}

/** The switch feed as the callout gives it: its wire label and, for a tap, its own fuse. */
export function switchFeedLabel(
  input: DiagramInput,
  main: { text: string },
): { from: "main" | "tap"; wire: string; fuseA: number | null } {
  const feed = input.switchFeed;
  if (feed === undefined) return { from: "main", wire: main.text, fuseA: null };
  const wire = feed.wire ? wireLabel(feed.wire) : main.text;
  return feed.from === "tap" ? { from: "tap", wire, fuseA: feed.fuseA } : { from: "main", wire, fuseA: null };
}

/** The size the page should show: what the author chose, else the engine's minimum. */
export function diagramWireLabel(input: DiagramInput, result: CircuitResult): { text: string; chosen: boolean } {
  if (input.wire) return { text: wireLabel(input.wire), chosen: true };
  if (result.minWire.awg !== null) return { text: `${result.minWire.awg} AWG min.`, chosen: false };
  if (result.minWire.mm2 !== null) return { text: `${result.minWire.mm2} mm² min.`, chosen: false };
  return { text: "no size fits", chosen: false };
}

export function usesRelay(input: DiagramInput, result: CircuitResult): boolean {
  // The diagram shows what the author does; relay-recommended and switch-overloaded report the gap.
  return input.relay ?? (result.relayNeeded || input.switchFeed !== undefined);
}

export function wiringDiagramSvg(input: DiagramInput, result: CircuitResult, options: { idPrefix?: string } = {}): string {
  const id = options.idPrefix ?? `tl-wd-${hashId(JSON.stringify(input))}`;
  const relay = usesRelay(input, result);
  const size = diagramWireLabel(input, result);
  const sizeCls = size.text === "no size fits" ? "tl-size tl-alert" : "tl-size";
  const fuse = fuseSymbol(input, result);
  const chassis = input.returnPath === "chassis";
  const heading = input.label ? input.label.slice(0, 60) : "Circuit";
  const load = input.loadAmps !== undefined ? `${num(input.loadAmps)} A` : `${num(input.loadWatts ?? 0)} W`;
  const parts: string[] = [];

  parts.push(text(20, 24, `${heading} — ${num(result.currentA)} A at ${input.systemVoltage} V`, "tl-heading", "start"));
  // Battery, + on the rail, − below.
  parts.push(`<rect class="tl-part" x="20" y="48" width="50" height="64" rx="4"/>`);
  parts.push(text(45, 84, `${input.systemVoltage} V`), text(62, RAIL - 8, "+", "tl-terminal"), text(30, 106, "−", "tl-terminal"));
  parts.push(line(70, RAIL, 150, RAIL), text(110, RAIL - 8, size.text, sizeCls));
  parts.push(fuse.svg);

  const feed = switchFeedLabel(input, size);
  if (relay) {
    parts.push(relaySymbol());
    if (feed.from === "tap") {
      // A separate low-current tap with its own fuse feeds the switch; the main line goes only to terminal 30.
      parts.push(line(198, RAIL, 330, RAIL), text(264, RAIL - 8, size.text, sizeCls));
      parts.push(`<circle class="tl-part" cx="96" cy="${COIL}" r="4"/>`, text(96, COIL + 20, "fused tap", "tl-note"));
      parts.push(line(100, COIL, 150, COIL), fuseBox(174, COIL), text(174, COIL + 26, `${num(feed.fuseA ?? 0)} A fuse`));
      parts.push(line(198, COIL, 252, COIL), text(225, COIL - 8, feed.wire, "tl-size"));
    } else {
      // Switch fed from behind the main fuse, so that fuse must protect the feed wire too.
      parts.push(line(198, RAIL, 330, RAIL), dot(232, RAIL), text(281, RAIL - 8, size.text, sizeCls));
      parts.push(line(232, RAIL, 232, COIL), line(232, COIL, 252, COIL));
      parts.push(text(226, COIL - 22, feed.wire, feed.wire === size.text ? sizeCls : "tl-size", "end"));
    }
    parts.push(inlineSwitch(252, 302, COIL), line(302, COIL, 330, COIL));
    parts.push(line(430, COIL, 460, COIL), line(460, COIL, 460, chassis ? 200 : RETURN));
    parts.push(text(466, COIL + 24, feed.wire, "tl-size", "start"));
    parts.push(chassis ? chassisGround(460, 200) : dot(460, RETURN));
    parts.push(line(430, RAIL, 520, RAIL), text(475, RAIL - 8, size.text, sizeCls));
  } else {
    parts.push(line(198, RAIL, 355, RAIL), text(276, RAIL - 8, size.text, sizeCls));
    parts.push(inlineSwitch(355, 405, RAIL));
    parts.push(line(405, RAIL, 520, RAIL), text(462, RAIL - 8, size.text, sizeCls));
  }

  parts.push(`<rect class="tl-part" x="520" y="48" width="80" height="44" rx="4"/>`);
  parts.push(text(560, 66, "LOAD"), text(560, 83, load, "tl-note"));
  if (chassis) {
    parts.push(line(560, 92, 560, 130), chassisGround(560, 130), text(574, 124, "chassis", "tl-note", "start"));
    parts.push(line(45, 112, 45, 130), chassisGround(45, 130));
  } else {
    parts.push(line(560, 92, 560, RETURN), line(560, RETURN, 45, RETURN), line(45, 112, 45, RETURN));
    parts.push(text(300, RETURN - 8, `${size.text} return`, sizeCls));
  }

  const switchFrom =
    feed.from === "tap"
      ? `The switch takes its feed from a separate tap behind its own ${num(feed.fuseA ?? 0)} A fuse on ${feed.wire} wire`
      : `The switch takes its feed behind the main fuse on ${feed.wire} wire`;
  const path = relay
    ? `then ${size.text} wire to relay terminal 30; terminal 87 feeds the load through ${size.text} wire. ` +
      `${switchFrom} and drives coil terminal 86; coil terminal 85 goes to ground on ${feed.wire} wire.`
    : `then ${size.text} wire through the switch to the load.`;
  const ground = chassis
    ? "The load returns through the vehicle chassis."
    : `The load returns to battery negative through ${size.text} wire.`;
  const desc = `Battery positive (${input.systemVoltage} V) through ${fuse.words}, ${path} ${ground} The load draws ${num(result.currentA)} A.`;

  return [
    `<svg xmlns="http://www.w3.org/2000/svg" class="tl-diagram" viewBox="0 0 ${WIDTH} ${HEIGHT}" width="${WIDTH}" height="${HEIGHT}" role="img" aria-labelledby="${id}-title ${id}-desc" fill="none" stroke="currentColor" stroke-width="2" stroke-linecap="round" font-family="system-ui, sans-serif" font-size="11">`,
    `<title id="${id}-title">${escapeXml(`Wiring diagram: ${heading}`)}</title>`,
    `<desc id="${id}-desc">${escapeXml(desc)}</desc>`,
    `<style>${DIAGRAM_STYLE}</style>`,
    ...parts,
    `</svg>`,
  ].join("");
}
