import { getSchema, type JSONContent } from "@tiptap/core";
import { Node as PMNode } from "@tiptap/pm/model";
import StarterKit from "@tiptap/starter-kit";
import { renderToHTMLString } from "@tiptap/static-renderer/pm/html-string";

/** The rich-text features a step body may use; the editor is built with the same list. */
const extensions = [StarterKit.configure({ link: { openOnClick: false } })];
// Built once per process: building the schema per render dominated guide page time.
const schema = getSchema(extensions);

export class RichTextError extends Error {}

/**
 * Turns a step body (Tiptap JSON) into HTML and plain text. Runs when a draft is saved, so the
 * reader's page serves stored HTML. Content that does not fit the schema is refused.
 */
export function renderBody(content: unknown): { html: string; text: string } {
  let node: PMNode;
  try {
    node = PMNode.fromJSON(schema, content as JSONContent);
    node.check();
  } catch (error) {
    throw new RichTextError(`The step text is not valid rich text: ${(error as Error).message}`);
  }
  node.descendants((child) => {
    for (const mark of child.marks) {
      if (mark.type.name === "link" && !/^(https?:|mailto:)/i.test(String(mark.attrs.href ?? ""))) {
        throw new RichTextError("Links in step text must start with http://, https:// or mailto:");
      }
    }
  });
  const html = renderToHTMLString({ extensions, content: node });
  const text = node.textBetween(0, node.content.size, "\n", " ").replace(/\s+/g, " ").trim();
  return { html, text };
}
