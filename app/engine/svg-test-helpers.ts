/**
 * A strict little reader for the SVG the engine writes, so tests check
 * structure rather than snapshots: it throws on anything not well formed.
 */
export type SvgNode = { name: string; attrs: Record<string, string>; children: SvgNode[]; text: string };

const TOKEN = /<(\/?)([a-zA-Z][\w:-]*)((?:\s+[\w:-]+="[^"<]*")*)\s*(\/?)>|([^<]+)/y;
const ATTR = /([\w:-]+)="([^"]*)"/g;
const ENTITY: Record<string, string> = { "&amp;": "&", "&lt;": "<", "&gt;": ">", "&quot;": '"', "&#39;": "'" };

function decodeEntities(text: string): string {
  const stray = text.replace(/&(amp|lt|gt|quot|#39);/g, "").includes("&");
  if (stray) throw new Error(`unescaped & in ${JSON.stringify(text)}`);
  return text.replace(/&(amp|lt|gt|quot|#39);/g, (m) => ENTITY[m]);
}

export function parseSvg(xml: string): SvgNode {
  const root: SvgNode = { name: "#document", attrs: {}, children: [], text: "" };
  const stack = [root];
  TOKEN.lastIndex = 0;
  while (TOKEN.lastIndex < xml.length) {
    const at = TOKEN.lastIndex;
    const m = TOKEN.exec(xml);
    if (!m) throw new Error(`not well formed at ${at}: ${xml.slice(at, at + 40)}`);
    const [, closing, name, attrText, selfClosing, text] = m;
    const top = stack[stack.length - 1];
    if (text !== undefined) {
      top.text += decodeEntities(text);
      continue;
    }
    if (closing) {
      if (top.name !== name) throw new Error(`</${name}> closes <${top.name}>`);
      stack.pop();
      continue;
    }
    const attrs: Record<string, string> = {};
    for (const [, key, value] of attrText.matchAll(ATTR)) attrs[key] = decodeEntities(value);
    const node: SvgNode = { name, attrs, children: [], text: "" };
    top.children.push(node);
    if (!selfClosing) stack.push(node);
  }
  if (stack.length !== 1) throw new Error(`<${stack[stack.length - 1].name}> never closed`);
  if (root.children.length !== 1 || root.children[0].name !== "svg") throw new Error("expected one <svg> root");
  return root.children[0];
}

export function findAll(node: SvgNode, name: string): SvgNode[] {
  return node.children.flatMap((child) => [...(child.name === name ? [child] : []), ...findAll(child, name)]);
}

export function texts(node: SvgNode): string[] {
  return findAll(node, "text").map((t) => t.text);
}
