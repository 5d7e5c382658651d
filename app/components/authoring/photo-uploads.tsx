import { useCallback, useEffect, useRef, useState } from "react";
import { fieldId } from "~/components/editor/field-paths";
import { moveItem } from "~/components/editor/list-state";
import type { EditorPhoto, PhotoVariant } from "./draft-state";

type Uploaded = { id: number; width: number; height: number; variants: PhotoVariant[] };

type Upload = {
  key: number;
  file: File;
  state: "queued" | "uploading" | "processing" | "failed";
  sent: number;
  message?: string;
  xhr?: XMLHttpRequest;
};

/** Uploads at once from one page; the server also runs at most two image jobs at a time. */
const AT_ONCE = 2;
let nextKey = 1;

/** Sends one file to `POST /api/media`, reporting the bytes sent; resolves with the stored photo. */
function send(upload: Upload, onProgress: (sent: number) => void): { xhr: XMLHttpRequest; done: Promise<Uploaded> } {
  const xhr = new XMLHttpRequest();
  const done = new Promise<Uploaded>((resolve, reject) => {
    xhr.open("POST", "/api/media");
    xhr.responseType = "json";
    xhr.upload.onprogress = (e) => onProgress(e.lengthComputable ? e.loaded / e.total : 0);
    xhr.onload = () => {
      if (xhr.status === 201) resolve(xhr.response as Uploaded);
      else
        reject(
          new Error(
            (xhr.response as { error?: { message?: string } } | null)?.error?.message ?? `The upload failed (${xhr.status}).`,
          ),
        );
    };
    xhr.onerror = () => reject(new Error("The connection dropped during the upload."));
    xhr.onabort = () => reject(new DOMException("cancelled", "AbortError"));
    const form = new FormData();
    form.append("file", upload.file);
    xhr.send(form);
  });
  return { xhr, done };
}

const pill =
  "inline-flex min-h-11 items-center rounded-md border border-rule bg-white px-3 text-sm font-semibold text-spruce-800 hover:bg-paper-deep";

/**
 * A step's photos: drop or pick several files (a phone offers its camera), each with its own
 * progress, cancel and retry; then alt text, caption, order and removal for the stored ones.
 */
export function StepPhotos({
  path,
  photos,
  onChange,
  errors,
}: {
  path: string;
  photos: EditorPhoto[];
  onChange: (update: (photos: EditorPhoto[]) => EditorPhoto[]) => void;
  errors: Record<string, string>;
}) {
  const [uploads, setUploads] = useState<Upload[]>([]);
  const [over, setOver] = useState(false);
  const input = useRef<HTMLInputElement>(null);
  const uploadsRef = useRef(uploads);
  uploadsRef.current = uploads;
  const domId = fieldId(path);

  const patch = useCallback(
    (key: number, change: Partial<Upload>) => setUploads((list) => list.map((u) => (u.key === key ? { ...u, ...change } : u))),
    [],
  );

  // Starts queued uploads while fewer than AT_ONCE are on their way.
  useEffect(() => {
    const busy = uploads.filter((u) => u.state === "uploading" || u.state === "processing").length;
    const waiting = uploads.filter((u) => u.state === "queued").slice(0, Math.max(0, AT_ONCE - busy));
    for (const upload of waiting) {
      const { xhr, done } = send(upload, (sent) => patch(upload.key, { sent, state: sent >= 1 ? "processing" : "uploading" }));
      patch(upload.key, { state: "uploading", sent: 0, xhr, message: undefined });
      done.then(
        (stored) => {
          setUploads((list) => list.filter((u) => u.key !== upload.key));
          onChange((list) => [...list, { mediaId: stored.id, alt: "", caption: null, variants: stored.variants }]);
        },
        (error: Error) => {
          if (error.name === "AbortError") setUploads((list) => list.filter((u) => u.key !== upload.key));
          else patch(upload.key, { state: "failed", message: error.message, xhr: undefined });
        },
      );
    }
  }, [uploads, onChange, patch]);

  // Leaving the page cancels what is still on its way.
  useEffect(
    () => () => {
      for (const u of uploadsRef.current) u.xhr?.abort();
    },
    [],
  );

  const addFiles = (files: FileList | null) => {
    if (!files?.length) return;
    const added = [...files].map((file): Upload => ({ key: nextKey++, file, state: "queued", sent: 0 }));
    setUploads((list) => [...list, ...added]);
  };

  const thumb = (p: EditorPhoto) => p.variants?.find((v) => v.format === "jpeg")?.url ?? p.variants?.[0]?.url;
  const move = (from: number, to: number) => onChange((list) => moveItem(list, from, to - from));

  return (
    <div className="mt-4">
      <h4 className="text-sm font-semibold text-ink">Photos</h4>
      {photos.length ? (
        <ul className="mt-2 space-y-3">
          {photos.map((p, j) => {
            const altId = `${domId}-${j}-alt`;
            const altError = errors[`${path}.${j}.alt`];
            return (
              <li
                key={`${p.mediaId}-${j}`}
                className="grid gap-3 rounded-lg border border-rule bg-white p-3 sm:grid-cols-[8rem_1fr]"
              >
                {thumb(p) ? (
                  <img src={thumb(p)} alt="" className="h-24 w-32 rounded object-cover" />
                ) : (
                  <div className="h-24 w-32 rounded bg-paper-deep" />
                )}
                <div className="min-w-0">
                  <label htmlFor={altId} className="block text-sm font-semibold">
                    Alt text{" "}
                    <span className="font-normal text-ink-soft">(what the photo shows, for readers who cannot see it)</span>
                  </label>
                  <input
                    id={altId}
                    value={p.alt}
                    maxLength={300}
                    onChange={(e) => onChange((list) => list.map((x, k) => (k === j ? { ...x, alt: e.target.value } : x)))}
                    aria-invalid={altError ? true : undefined}
                    aria-describedby={altError ? `${altId}-error` : undefined}
                    className={`mt-1 min-h-11 w-full rounded-md border bg-paper px-3 ${altError ? "border-z-danger" : "border-rule"}`}
                  />
                  {altError ? (
                    <p id={`${altId}-error`} className="mt-1 text-sm font-medium text-z-danger">
                      {altError}
                    </p>
                  ) : null}
                  <label htmlFor={`${domId}-${j}-caption`} className="mt-2 block text-sm font-semibold">
                    Caption <span className="font-normal text-ink-soft">(optional)</span>
                  </label>
                  <input
                    id={`${domId}-${j}-caption`}
                    value={p.caption ?? ""}
                    maxLength={300}
                    onChange={(e) =>
                      onChange((list) => list.map((x, k) => (k === j ? { ...x, caption: e.target.value || null } : x)))
                    }
                    className="mt-1 min-h-11 w-full rounded-md border border-rule bg-paper px-3"
                  />
                  <div className="mt-2 flex flex-wrap gap-2">
                    <button type="button" className={pill} disabled={j === 0} onClick={() => move(j, j - 1)}>
                      Earlier<span className="sr-only"> (photo {j + 1})</span>
                    </button>
                    <button type="button" className={pill} disabled={j === photos.length - 1} onClick={() => move(j, j + 1)}>
                      Later<span className="sr-only"> (photo {j + 1})</span>
                    </button>
                    <button type="button" className={pill} onClick={() => onChange((list) => list.filter((_, k) => k !== j))}>
                      Remove<span className="sr-only"> photo {j + 1}</span>
                    </button>
                  </div>
                </div>
              </li>
            );
          })}
        </ul>
      ) : null}
      {uploads.length ? (
        <ul className="mt-2 space-y-2" aria-label="Uploads">
          {uploads.map((u) => (
            <li key={u.key} className="rounded-lg border border-rule bg-white p-3 text-sm">
              <div className="flex flex-wrap items-center justify-between gap-2">
                <span className="min-w-0 truncate font-medium">{u.file.name}</span>
                <span className="text-ink-soft" aria-live="polite">
                  {u.state === "queued"
                    ? "queued"
                    : u.state === "uploading"
                      ? `uploading ${Math.round(u.sent * 100)} %`
                      : u.state === "processing"
                        ? "resizing…"
                        : "not uploaded"}
                </span>
              </div>
              <progress
                className="mt-2 h-2 w-full"
                max={1}
                value={u.state === "queued" ? 0 : u.state === "failed" ? 0 : u.sent}
                aria-label={`Upload of ${u.file.name}`}
              />
              {u.message ? (
                <p role="alert" className="mt-1 font-medium text-z-danger">
                  {u.message}
                </p>
              ) : null}
              <div className="mt-2 flex gap-2">
                {u.state === "failed" ? (
                  <button type="button" className={pill} onClick={() => patch(u.key, { state: "queued", sent: 0 })}>
                    Retry
                  </button>
                ) : null}
                <button
                  type="button"
                  className={pill}
                  onClick={() => {
                    if (u.xhr) u.xhr.abort();
                    else setUploads((list) => list.filter((x) => x.key !== u.key));
                  }}
                >
                  {u.state === "failed" ? "Dismiss" : "Cancel"}
                </button>
              </div>
            </li>
          ))}
        </ul>
      ) : null}
      {/* biome-ignore lint/a11y/noStaticElementInteractions: a drop target for a mouse; the button inside does the same for everyone */}
      <div
        onDragOver={(e) => {
          e.preventDefault();
          setOver(true);
        }}
        onDragLeave={() => setOver(false)}
        onDrop={(e) => {
          e.preventDefault();
          setOver(false);
          addFiles(e.dataTransfer.files);
        }}
        className={`mt-2 rounded-lg border-2 border-dashed p-4 text-center text-sm ${over ? "border-spruce-600 bg-spruce-50" : "border-rule"}`}
      >
        <p className="text-ink-soft">Drop photos here (JPEG, PNG, WebP or HEIC from a phone, up to 25 MB each), or</p>
        <button type="button" className={`${pill} mt-2`} onClick={() => input.current?.click()}>
          Choose photos
        </button>
        <input
          ref={input}
          id={domId}
          type="file"
          accept="image/jpeg,image/png,image/webp,image/heic,image/heif,.heic,.heif"
          multiple
          className="sr-only"
          tabIndex={-1}
          aria-label="Choose photos"
          onChange={(e) => {
            addFiles(e.target.files);
            e.target.value = "";
          }}
        />
      </div>
    </div>
  );
}
