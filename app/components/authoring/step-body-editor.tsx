import { EditorContent, useEditor, useEditorState } from "@tiptap/react";
import { useState } from "react";
import { ALLOWED_LINK, stepBodyExtensions } from "~/utils/rich-text";

const tool =
  "inline-flex min-h-11 min-w-11 items-center justify-center rounded-md border border-rule bg-white px-2 text-sm font-semibold text-spruce-900 hover:bg-paper-deep aria-pressed:bg-spruce-800 aria-pressed:text-paper";

/**
 * A step's text: Tiptap with the same extensions the server checks and renders with. The toolbar
 * names each button's keyboard shortcut; a link must be a web page or a mail address.
 */
export function StepBodyEditor({
  id,
  label,
  value,
  onChange,
  error,
}: {
  id: string;
  label: string;
  value: Record<string, unknown>;
  onChange: (body: Record<string, unknown>) => void;
  error?: string;
}) {
  const [linkOpen, setLinkOpen] = useState(false);
  const [href, setHref] = useState("");
  const [linkProblem, setLinkProblem] = useState<string | null>(null);
  const editor = useEditor({
    extensions: stepBodyExtensions,
    content: value,
    immediatelyRender: false,
    // Its own <style> element would break the page's style-src policy; app.css carries the few rules.
    injectCSS: false,
    editorProps: {
      attributes: {
        id,
        role: "textbox",
        "aria-multiline": "true",
        "aria-label": label,
        ...(error ? { "aria-invalid": "true", "aria-describedby": `${id}-error` } : {}),
        class: "prose max-w-none min-h-32 px-3 py-2 font-serif focus:outline-none",
      },
    },
    onUpdate: ({ editor: e }) => onChange(e.getJSON() as Record<string, unknown>),
  });
  const active = useEditorState({
    editor,
    selector: ({ editor: e }) =>
      e
        ? {
            bold: e.isActive("bold"),
            italic: e.isActive("italic"),
            bullet: e.isActive("bulletList"),
            ordered: e.isActive("orderedList"),
            heading: e.isActive("heading", { level: 3 }),
            link: e.isActive("link"),
          }
        : null,
  });

  const applyLink = () => {
    if (!editor) return;
    const target = href.trim();
    if (target === "") {
      editor.chain().focus().extendMarkRange("link").unsetLink().run();
      setLinkOpen(false);
      return;
    }
    if (!ALLOWED_LINK.test(target)) {
      setLinkProblem("A link must start with https://, http:// or mailto:");
      return;
    }
    editor.chain().focus().extendMarkRange("link").setLink({ href: target }).run();
    setLinkOpen(false);
    setLinkProblem(null);
  };

  const button = (name: string, shortcut: string, pressed: boolean | undefined, run: () => void, text: React.ReactNode) => (
    <button
      type="button"
      className={tool}
      aria-pressed={!!pressed}
      title={`${name} (${shortcut})`}
      aria-label={`${name} (${shortcut})`}
      onMouseDown={(e) => e.preventDefault()}
      onClick={run}
      disabled={!editor}
    >
      {text}
    </button>
  );

  return (
    <div>
      <div className={`rounded-md border bg-paper ${error ? "border-z-danger" : "border-rule"}`}>
        <div role="toolbar" aria-label={`${label}: formatting`} className="flex flex-wrap gap-1 border-b border-rule p-1.5">
          {button("Bold", "Ctrl+B", active?.bold, () => editor?.chain().focus().toggleBold().run(), <b>B</b>)}
          {button("Italic", "Ctrl+I", active?.italic, () => editor?.chain().focus().toggleItalic().run(), <i>I</i>)}
          {button("Heading", "Ctrl+Alt+3", active?.heading, () => editor?.chain().focus().toggleHeading({ level: 3 }).run(), "H")}
          {button(
            "Bulleted list",
            "Ctrl+Shift+8",
            active?.bullet,
            () => editor?.chain().focus().toggleBulletList().run(),
            "• List",
          )}
          {button(
            "Numbered list",
            "Ctrl+Shift+7",
            active?.ordered,
            () => editor?.chain().focus().toggleOrderedList().run(),
            "1. List",
          )}
          {button(
            "Link",
            "Ctrl+K",
            active?.link,
            () => {
              setHref(String(editor?.getAttributes("link").href ?? ""));
              setLinkProblem(null);
              setLinkOpen((o) => !o);
            },
            "Link",
          )}
        </div>
        {linkOpen ? (
          <div className="flex flex-wrap items-start gap-2 border-b border-rule p-2">
            <label htmlFor={`${id}-href`} className="sr-only">
              Link address
            </label>
            <input
              id={`${id}-href`}
              type="url"
              value={href}
              placeholder="https://…"
              maxLength={2000}
              onChange={(e) => setHref(e.target.value)}
              onKeyDown={(e) => {
                if (e.key === "Enter") {
                  e.preventDefault();
                  applyLink();
                }
                if (e.key === "Escape") setLinkOpen(false);
              }}
              aria-invalid={linkProblem ? true : undefined}
              aria-describedby={linkProblem ? `${id}-href-error` : undefined}
              className="min-h-11 min-w-0 flex-1 rounded-md border border-rule bg-white px-3"
            />
            <button type="button" className={tool} onClick={applyLink}>
              {href.trim() ? "Set link" : "Remove link"}
            </button>
            {linkProblem ? (
              <p id={`${id}-href-error`} className="w-full text-sm font-medium text-z-danger">
                {linkProblem}
              </p>
            ) : null}
          </div>
        ) : null}
        <EditorContent
          editor={editor}
          onKeyDown={(e) => {
            if ((e.ctrlKey || e.metaKey) && e.key.toLowerCase() === "k") {
              e.preventDefault();
              setHref(String(editor?.getAttributes("link").href ?? ""));
              setLinkOpen(true);
            }
          }}
        />
      </div>
      {error ? (
        <p id={`${id}-error`} className="mt-1 text-sm font-medium text-z-danger">
          {error}
        </p>
      ) : null}
    </div>
  );
}
