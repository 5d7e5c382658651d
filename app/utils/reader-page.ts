/**
 * A route whose page is the same for every reader who is not signed in says so with
 * `export const handle = READER_PAGE` (the Library, a guide page): the server renders it once and
 * keeps it, and a browser or shared cache may keep it too (app/services/http/document-cache.server.ts).
 * No other page is kept, since others change under the reader (the mail inbox, forms).
 */
export const READER_PAGE = { readerPage: true } as const;
