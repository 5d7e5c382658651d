import { getSchema, type JSONContent } from "@tiptap/core";
import { Node as PMNode } from "@tiptap/pm/model";
import { renderToHTMLString } from "@tiptap/static-renderer/pm/html-string";
import { AppError } from "~/utils/errors";
import { ALLOWED_LINK, stepBodyExtensions } from "~/utils/rich-text";

const extensions = stepBodyExtensions;
// Built once per process: building the schema per render dominated guide page time.
const schema = getSchema(extensions);

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
    throw new AppError(400, "invalid-rich-text", `The step text is not valid rich text: ${(error as Error).message}`);
  }
  node.descendants((child) => {
    for (const mark of child.marks) {
      if (mark.type.name === "link" && !ALLOWED_LINK.test(String(mark.attrs.href ?? ""))) {
        throw new AppError(400, "invalid-rich-text", "Links in step text must start with http://, https:// or mailto:");
      }
    }
  });
  const html = renderToHTMLString({ extensions, content: node });
  const text = node.textBetween(0, node.content.size, "\n", " ").replace(/\s+/g, " ").trim();
  return { html, text };
}
