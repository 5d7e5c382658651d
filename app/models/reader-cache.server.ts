import type { Db } from "~/db/client.server";
import { BoundedCache } from "~/utils/bounded-cache";
import { type CatalogueTree, getCatalogue } from "./catalogue.server";
import { type ContentStamps, readContentStamps } from "./content-stamps.server";
import { listFromIndex } from "./library-index.server";
import type { LibraryQuery } from "./library.server";

/**
 * What every reader sees alike, computed once per content stamp: the catalogue, and the Library's
 * answer for each query. A change to the catalogue or to any guide raises a stamp (triggers of
 * migration 0008), so the next read computes afresh; nothing is served that the database no
 * longer holds. Callers must not change what they are given.
 */
const catalogues = new BoundedCache<number, CatalogueTree>(2);

/** The vehicle catalogue as `getCatalogue` returns it (`stamps`: read by the caller for this request). */
export async function readCatalogue(db: Db, stamps?: ContentStamps): Promise<CatalogueTree> {
  const { catalogue: stamp } = stamps ?? (await readContentStamps(db));
  let tree = catalogues.get(stamp);
  if (!tree) {
    tree = await getCatalogue(db);
    catalogues.set(stamp, tree);
  }
  return tree;
}

type LibraryAnswer = Awaited<ReturnType<typeof listFromIndex>>;

/** A Library answer holds a page of 12 guides and the facet counts: some 10–20 KB each. */
const LIBRARY_ANSWERS_KEPT = 500;
const libraryAnswers = new BoundedCache<string, LibraryAnswer>(LIBRARY_ANSWERS_KEPT);

/** What a Library answer is kept by: the query and the stamps it depends on. */
export function libraryKey(query: LibraryQuery, stamps: ContentStamps): string {
  // The "most reported fits" order changes with readers' reports too.
  const reports = query.sort === "fits" ? stamps.reports : "";
  return `${stamps.guides}.${stamps.catalogue}.${reports}:${JSON.stringify(query)}`;
}

/** The Library's answer (from its in-memory index), kept per query and content stamp. */
export async function readLibrary(db: Db, query: LibraryQuery, stamps?: ContentStamps): Promise<LibraryAnswer> {
  const now = stamps ?? (await readContentStamps(db));
  const key = libraryKey(query, now);
  let answer = libraryAnswers.get(key);
  if (!answer) {
    answer = await listFromIndex(db, query, now);
    libraryAnswers.set(key, answer);
  }
  return answer;
}
