import { Readable } from "node:stream";
import busboy from "busboy";
import { AppError, invalid, tooLarge, unsupportedType } from "~/utils/errors";
import { ACCEPTED_FORMATS_TEXT, detectPhotoType, MAX_UPLOAD_BYTES } from "./images.server";

export type Upload = { file: Buffer; filename: string | null };

const FIELD = "file";
const tooBig = () => tooLarge(`The photo is larger than ${MAX_UPLOAD_BYTES / 1024 / 1024} MB. Send a smaller file.`);
const noFile = () => invalid({ [FIELD]: `Choose a photo to upload (${ACCEPTED_FORMATS_TEXT}).` }, "No photo was sent.");

/**
 * Reads one photo from a multipart/form-data body (RFC 7578) as it streams in, with busboy: at most
 * 25 MB (413 past it, reading stops there), one file in the field `file`, a handful of other parts.
 * The first bytes are checked as they arrive, so a PDF or a script is refused (415) without reading
 * the rest. Nothing here is stored.
 */
export function readPhotoUpload(request: Request): Promise<Upload> {
  const type = request.headers.get("content-type") ?? "";
  if (!/^multipart\/form-data\s*;/i.test(type) || !/boundary=/i.test(type)) {
    return Promise.reject(unsupportedType(`Send the photo as multipart/form-data, in the field "${FIELD}".`));
  }
  if (!request.body) return Promise.reject(noFile());
  const source = Readable.fromWeb(request.body as import("node:stream/web").ReadableStream);

  return new Promise<Upload>((resolve, reject) => {
    let settled = false;
    let parser: busboy.Busboy;
    try {
      parser = busboy({
        headers: { "content-type": type },
        limits: { fileSize: MAX_UPLOAD_BYTES + 1, files: 1, fields: 5, parts: 6, fieldSize: 1024, fieldNameSize: 100 },
      });
    } catch {
      reject(new AppError(400, "invalid", `The multipart body could not be read. Send the photo in the field "${FIELD}".`));
      return;
    }
    /**
     * Ends the exchange: stop parsing; the rest of the body is read and dropped, not cancelled (the
     * development server's request adapter writes into the stream until the client is done, and
     * fails on a cancelled one). The answer goes out at once either way.
     */
    const finish = (outcome: Upload | AppError) => {
      if (settled) return;
      settled = true;
      source.unpipe(parser);
      source.resume();
      if (outcome instanceof AppError) reject(outcome);
      else resolve(outcome);
    };
    let upload: Upload | null = null;
    let pending = false;

    parser.on("file", (name, stream, info) => {
      if (name !== FIELD || upload || pending) {
        stream.resume();
        return;
      }
      pending = true;
      const chunks: Buffer[] = [];
      let bytes = 0;
      let checked = false;
      stream.on("data", (chunk: Buffer) => {
        if (settled) return;
        bytes += chunk.length;
        chunks.push(chunk);
        if (!checked && bytes >= 12) {
          checked = true;
          if (!detectPhotoType(Buffer.concat(chunks))) {
            finish(
              unsupportedType(
                `This file is not a photo we accept. Send a ${ACCEPTED_FORMATS_TEXT} image (the type is read from the file itself).`,
              ),
            );
          }
        }
      });
      stream.on("limit", () => finish(tooBig()));
      stream.on("end", () => {
        pending = false;
        if (settled || (stream as { truncated?: boolean }).truncated) return;
        if (bytes === 0) return finish(invalid({ [FIELD]: "The chosen file is empty." }, "The photo is empty."));
        upload = { file: Buffer.concat(chunks), filename: info.filename ? info.filename.slice(0, 255) : null };
      });
    });
    const tooManyParts = () =>
      finish(
        invalid({ [FIELD]: "Send one photo per request, with no more than 5 other fields." }, "The form has too many parts."),
      );
    parser.on("filesLimit", tooManyParts);
    parser.on("fieldsLimit", tooManyParts);
    parser.on("partsLimit", tooManyParts);
    parser.on("error", () =>
      finish(
        new AppError(400, "invalid", `The multipart body could not be read. Send the photo in the field "${FIELD}".`, {
          [FIELD]: "The upload was cut short or malformed.",
        }),
      ),
    );
    parser.on("close", () => {
      if (settled) return;
      finish(upload ?? noFile());
    });
    source.on("error", () =>
      finish(new AppError(400, "invalid", "The upload did not arrive whole.", { [FIELD]: "The upload was cut short." })),
    );
    source.pipe(parser);
  });
}
