import { type FormEvent, useEffect, useRef, useState } from "react";
import { Form, Link, redirect, useLocation, useNavigate, useNavigation } from "react-router";
import { DocumentJson, dataBlockJson, useDocumentJson } from "~/components/document-html";
import { FitmentSummary } from "~/components/fitment";
import { documentFragmentsContext } from "~/services/http/document-fragments.server";
import { isDocumentRequest } from "~/services/http/request-kind.server";
import { SafetyNotice } from "~/components/chrome";
import { formatMinutes } from "~/utils/format";
import { type Db, getDb } from "~/db/client.server";
import { BoundedCache } from "~/utils/bounded-cache";
import { jsonReader } from "~/utils/page-json";
import { yearsLabel } from "~/models/catalogue.server";
import {
  type LibraryQuery,
  type LibrarySort,
  parseLibraryQuery,
  type Relaxable,
  withoutEmptyParams,
  withoutFilter,
} from "~/models/library.server";
import { type ContentStamps, readRequestStamps } from "~/models/content-stamps.server";
import { libraryKey, readCatalogue, readLibrary } from "~/models/reader-cache.server";
import type { CatalogueTree } from "~/models/catalogue.server";
import {
  CATEGORIES,
  CATEGORY_LABELS,
  DIFFICULTY_LABELS,
  DRIVETRAINS,
  FITMENT_LABELS,
  type FitmentStatus,
  POWERTRAIN_LABELS,
  POWERTRAINS,
} from "~/utils/vocab";
import { Pager } from "~/components/pager";
import { currentVehicle } from "~/models/vehicles.server";
import { READER_PAGE } from "~/utils/reader-page";
import type { Route } from "./+types/library";

/** The same for every reader who is not signed in: rendered once, and a browser may keep it. */
export const handle = READER_PAGE;

export const meta: Route.MetaFunction = () => [
  { title: "Torqueleaf · Reviewed install guides for vehicle accessories" },
  {
    name: "description",
    content:
      "Step-by-step install guides for lamps, outlets, racks and skid plates, filtered by your exact vehicle and powertrain, with checked fuse, wire and torque values.",
  },
];

export async function loader({ request, context }: Route.LoaderArgs) {
  const url = new URL(request.url);
  // A plain form sends every field, empty or not; the address keeps only the ones that filter.
  const kept = withoutEmptyParams(url.searchParams);
  if (kept) throw redirect(kept.size ? `${url.pathname}?${kept}` : url.pathname);
  const params = url.searchParams;
  // The page's one vehicle menu posts "make.model.generation"; the API takes the three separately.
  const vehicle = params.get("vehicle");
  if (vehicle) {
    const [make, model, generation] = vehicle.split(".");
    if (make) params.set("make", make);
    if (model) params.set("model", model);
    if (generation) params.set("generation", generation);
  }
  const query = parseLibraryQuery(params);
  const db = await getDb();
  const stamps = await readRequestStamps(context, db);
  // The variant the cards are judged against: the one the address names, else the reader's current
  // vehicle (a signed-in reader's, or a visitor's picked one; either makes the page private).
  query.for ??= query.fits ? undefined : (await currentVehicle({ request, context }, db))?.variantId;
  // The year as typed, so a year the catalogue does not cover stays in the box to be corrected.
  const yearText = (params.get("year") ?? "").slice(0, 20);
  const key = `${yearText}:${libraryKey(query, stamps)}`;
  let page = pageJson.get(key);
  if (page === undefined) {
    // The same JSON goes into a document as a data block (DocumentJson).
    page = dataBlockJson(await libraryPage(db, query, stamps, yearText));
    pageJson.set(key, page);
  }
  // A document carries the data once, as a data block; a navigation's data carries it.
  if (!isDocumentRequest(request)) return { page };
  context.set(documentFragmentsContext, new Map([[PAGE_JSON_ID, page]]));
  return { page: null };
}

/** The data block a document's Library page comes in. */
const PAGE_JSON_ID = "library-data";

/**
 * The page's data as one JSON string, made once per content stamps, query and year as typed: React
 * Router then hands over one string instead of walking a page of guides and every facet on each
 * request, and the document cache's key digests it once (document-cache.server.ts).
 */
const pageJson = new BoundedCache<string, string>(8 * 1024 * 1024, (json) => json.length);

type LibraryPage = Awaited<ReturnType<typeof libraryPage>>;
const readPage = jsonReader<LibraryPage>();

async function libraryPage(db: Db, query: LibraryQuery, stamps: ContentStamps, yearText: string) {
  const [result, catalogue] = await Promise.all([readLibrary(db, query, stamps), readCatalogue(db, stamps)]);
  const readerVariant = variantNamed(catalogue, query.fits ?? query.for);
  const selectedVehicle = [query.make, query.model, query.generation].filter(Boolean).join(".");
  const vehicles = catalogue.flatMap((make) =>
    make.models.flatMap((model) => [
      { value: `${make.slug}.${model.slug}`, label: `${make.name} ${model.name} (all years)` },
      // A generation whose every variant is retired is offered no more, unless the address already names it.
      ...model.generations
        .filter(
          (g) =>
            g.variants.length === 0 ||
            g.variants.some((v) => v.retiredAt === null) ||
            `${make.slug}.${model.slug}.${g.slug}` === selectedVehicle,
        )
        .map((g) => {
          const value = `${make.slug}.${model.slug}.${g.slug}`;
          const count = result.facets.vehicle[value] ?? 0;
          return {
            value,
            label: `${make.name} ${model.name} ${g.name} (${yearsLabel(g.firstYear, g.lastYear)}) · ${guidesCount(count)}`,
          };
        }),
    ]),
  );
  const { problems: _asked, ...shown } = query;
  // The variants of the generation picked, for "your variant" and "only guides that fit it".
  const variantChoices = generationVariants(catalogue, query);
  // Each filter an empty list could do without, as a link to the same list without it (the
  // reader's variant stays named for the cards when "fits my vehicle" is the one left out).
  const relax = result.relax.map((r) => {
    const without = withoutFilter(shown, r.field) ?? shown;
    return { ...r, href: libraryHref(r.field === "fits" ? { ...without, for: shown.fits } : without, 1) };
  });
  return { ...result, relax, query: shown, yearText, vehicles, selectedVehicle, readerVariant, variantChoices };
}

/** A variant of the catalogue by id, with the words a card's badge and the filter use for it. */
function variantNamed(catalogue: CatalogueTree, id: number | undefined) {
  if (id === undefined) return null;
  for (const make of catalogue)
    for (const model of make.models)
      for (const generation of model.generations)
        for (const variant of generation.variants)
          if (variant.id === id) {
            return { variantId: id, label: `${make.name} ${model.name} ${generation.name} ${variant.name}` };
          }
  return { variantId: id, label: "the vehicle asked for (not in the catalogue)" };
}

function generationVariants(catalogue: CatalogueTree, query: LibraryQuery) {
  if (!query.make || !query.model || !query.generation) return [];
  const generation = catalogue
    .find((m) => m.slug === query.make)
    ?.models.find((m) => m.slug === query.model)
    ?.generations.find((g) => g.slug === query.generation);
  return (generation?.variants ?? [])
    .filter((v) => v.retiredAt === null || v.id === query.fits || v.id === query.for)
    .map((v) => ({ id: v.id, name: v.name }));
}

const SORT_LABELS: Record<LibrarySort, string> = {
  newest: "Newest first",
  fits: "Most reported fits",
  shortest: "Shortest time first",
};

/** What each filter is called in "Without the … filter". */
const FILTER_NAMES: Record<Relaxable, string> = {
  q: "search",
  vehicle: "vehicle",
  year: "model year",
  fits: "“fits my vehicle”",
  powertrain: "powertrain",
  drivetrain: "drivetrain",
  category: "category",
  difficulty: "difficulty",
};

const VEHICLE_FIT_STYLE: Record<FitmentStatus | "not-listed", { mark: string; words: string; className: string }> = {
  fits: { mark: "●", words: FITMENT_LABELS.fits, className: "border-spruce-200 bg-spruce-50 text-spruce-800" },
  "fits-with-changes": {
    mark: "◐",
    words: FITMENT_LABELS["fits-with-changes"],
    className: "border-brass-100 bg-brass-50 text-brass-700",
  },
  "does-not-fit": { mark: "✕", words: FITMENT_LABELS["does-not-fit"], className: "border-rule border-dashed bg-paper text-ink" },
  "not-listed": { mark: "?", words: "Not listed", className: "border-rule border-dashed bg-paper text-ink-soft" },
};

/** How a guide fits the reader's variant, in words and a mark (shape as well as colour). */
function VehicleFit({ fit, label }: { fit: { status: FitmentStatus | "not-listed"; note: string | null }; label: string }) {
  const style = VEHICLE_FIT_STYLE[fit.status];
  return (
    <p className={`mt-3 rounded-md border px-3 py-2 text-sm ${style.className}`}>
      <span aria-hidden="true">{style.mark} </span>
      <strong className="font-semibold">{style.words}</strong> for your {label}
      {fit.status === "not-listed" ? ": the author has not said whether it fits." : null}
      {fit.note ? <span className="block text-ink-soft">{fit.note}</span> : null}
    </p>
  );
}

/** "3 guides", "1 guide", "no guides": a count that says what it counts. */
function guidesCount(n: number) {
  if (n === 0) return "no guides";
  return `${n} ${n === 1 ? "guide" : "guides"}`;
}

/** The Library's address for a query, without empty or default values. */
function libraryHref(query: Omit<LibraryQuery, "problems">, page: number) {
  const params = new URLSearchParams();
  const { make, model, generation, year, powertrain, drivetrain, category, difficulty, q, fits, sort } = query;
  const vehicle = [make, model, generation].filter(Boolean).join(".");
  if (q) params.set("q", q);
  if (vehicle) params.set("vehicle", vehicle);
  for (const [k, v] of Object.entries({ year, powertrain, drivetrain, category, difficulty, fits, for: query.for, sort })) {
    if (v !== undefined) params.set(k, String(v));
  }
  if (page > 1) params.set("page", String(page));
  return params.size ? `/?${params}` : "/";
}

function FacetGroup<T extends string>({
  legend,
  name,
  values,
  labels,
  counts,
  selected,
}: {
  legend: string;
  name: string;
  values: readonly T[];
  labels?: Record<T, string>;
  counts: Record<string, number>;
  selected: string | undefined;
}) {
  return (
    <fieldset className="mt-5">
      <legend className="text-xs font-semibold uppercase tracking-wider text-ink-soft">{legend}</legend>
      <div className="mt-1">
        <label className="flex min-h-11 items-center gap-2 text-sm">
          <input type="radio" name={name} value="" defaultChecked={!selected} className="h-4 w-4 accent-spruce-700" />
          Any
        </label>
        {values.map((value) => (
          <label key={value} className="flex min-h-11 items-center gap-2 text-sm">
            <input
              type="radio"
              name={name}
              value={value}
              defaultChecked={selected === value}
              className="h-4 w-4 accent-spruce-700"
            />
            <span className="flex-1">{labels ? labels[value] : value}</span>
            <span className="text-xs tabular-nums text-ink-soft">{guidesCount(counts[value] ?? 0)}</span>
          </label>
        ))}
      </div>
    </fieldset>
  );
}

/** Text boxes apply their value this long after the last keystroke. */
const TYPING_PAUSE_MS = 400;

/**
 * The filter form's navigation. Every change builds the address from the form without its empty
 * fields. A click on a radio or a menu is one history entry; a run of typing in a text box is one
 * entry too: its first pause adds the entry, later pauses replace it, and Enter or leaving the box
 * ends the run. Any address the form did not make itself (Clear, Back, Forward, a pager link) gives
 * the form a new key, so every control shows that address again.
 */
function useFilterNavigation() {
  const location = useLocation();
  const navigate = useNavigate();
  const own = useRef<string | null>(null);
  const seen = useRef(location.key);
  const typing = useRef<{ timer?: ReturnType<typeof setTimeout>; pushed: boolean }>({ pushed: false });
  const [formKey, setFormKey] = useState(0);

  useEffect(() => {
    if (location.key === seen.current) return;
    seen.current = location.key;
    if (location.search !== own.current) {
      clearTimeout(typing.current.timer);
      typing.current = { pushed: false };
      setFormKey((k) => k + 1);
    }
    own.current = null;
  }, [location.key, location.search]);

  useEffect(() => () => clearTimeout(typing.current.timer), []);

  const go = (form: HTMLFormElement, replace: boolean) => {
    const params = new URLSearchParams();
    for (const [k, v] of new FormData(form)) {
      if (typeof v === "string" && v.trim() !== "") params.set(k, v.trim());
    }
    const search = params.size ? `?${params}` : "";
    if (search === location.search) return;
    own.current = search;
    navigate(`/${search}`, { replace, preventScrollReset: true });
  };

  const isTextBox = (el: EventTarget) => el instanceof HTMLInputElement && (el.type === "search" || el.type === "number");

  const endTyping = (form: HTMLFormElement) => {
    const run = typing.current;
    clearTimeout(run.timer);
    typing.current = { pushed: false };
    go(form, run.pushed);
  };

  return {
    formKey,
    /** A control outside the form (the sort menu) applies the form at once. */
    apply(form: HTMLFormElement | null) {
      if (form) endTyping(form);
    },
    onChange(event: FormEvent<HTMLFormElement>) {
      const form = event.currentTarget;
      const target = event.target;
      if (!isTextBox(target)) {
        endTyping(form);
        return;
      }
      const input = target as HTMLInputElement;
      clearTimeout(typing.current.timer);
      // A year applies on its own only once it has all four digits; otherwise on Enter or on leaving the box.
      if (input.name === "year" && input.value !== "" && !/^\d{4}$/.test(input.value)) return;
      typing.current.timer = setTimeout(() => {
        go(form, typing.current.pushed);
        typing.current.pushed = true;
      }, TYPING_PAUSE_MS);
    },
    onBlur(event: FormEvent<HTMLFormElement>) {
      if (isTextBox(event.target)) endTyping(event.currentTarget);
    },
    onSubmit(event: FormEvent<HTMLFormElement>) {
      event.preventDefault();
      endTyping(event.currentTarget);
    },
  };
}

/** Opens the filter panel on wide screens once the page runs; on a phone it starts closed, under its summary. */
function useWideOpen() {
  const ref = useRef<HTMLDetailsElement>(null);
  useEffect(() => {
    if (ref.current && window.matchMedia("(min-width: 64rem)").matches) ref.current.open = true;
  }, []);
  return ref;
}

export default function Library({ loaderData }: Route.ComponentProps) {
  const {
    guides,
    total,
    page,
    pages,
    facets,
    problems,
    relax,
    query,
    yearText,
    vehicles,
    selectedVehicle,
    readerVariant,
    variantChoices,
  } = readPage(useDocumentJson(PAGE_JSON_ID, loaderData.page));
  const [scripted, setScripted] = useState(false);
  useEffect(() => setScripted(true), []);
  const navigation = useNavigation();
  const busy = navigation.state === "loading" && navigation.location.pathname === "/";
  const filters = useFilterNavigation();
  const panel = useWideOpen();
  const active = [
    query.q,
    selectedVehicle,
    query.year,
    query.powertrain,
    query.drivetrain,
    query.category,
    query.difficulty,
    query.fits,
  ].filter((v) => v !== undefined && v !== "").length;
  const notices = Object.entries(problems).filter(([field]) => field !== "page");

  return (
    <div className="mx-auto max-w-6xl px-4 py-6 sm:px-6 lg:py-10">
      {loaderData.page === null ? <DocumentJson id={PAGE_JSON_ID} /> : null}
      <header className="max-w-3xl">
        <h1 className="font-serif text-3xl font-semibold tracking-tight text-spruce-900 md:text-5xl">
          Install guides you can check before you drill
        </h1>
        <p className="mt-3 text-ink-soft md:text-lg">
          Written by owners and shop technicians, reviewed by editors. Filter by your vehicle and powertrain: a hybrid with its 12
          V battery in the cargo area needs a different wire run than the same model with a gasoline engine.
        </p>
      </header>

      <div className="mt-6 grid gap-6 lg:mt-8 lg:grid-cols-[17rem_1fr] lg:gap-8">
        <details ref={panel} className="library-filters no-print h-fit min-w-0 rounded-xl border border-rule bg-white shadow-sm">
          <summary className="flex min-h-11 cursor-pointer items-center justify-between gap-3 px-4 py-2 font-semibold text-spruce-900">
            <span>
              Filters and search
              {active ? <span className="font-normal text-ink-soft">{` · ${active} active`}</span> : null}
            </span>
            <span aria-hidden="true" className="library-filters-mark text-ink-soft">
              ▾
            </span>
          </summary>
          <Form
            key={filters.formKey}
            id="library-filters"
            method="get"
            role="search"
            aria-label="Filter guides"
            className="border-t border-rule p-4 lg:border-t-0 lg:p-5"
            onChange={filters.onChange}
            onBlur={filters.onBlur}
            onSubmit={filters.onSubmit}
          >
            <label className="block text-xs font-semibold uppercase tracking-wider text-ink-soft" htmlFor="q">
              Search
            </label>
            <input
              id="q"
              name="q"
              type="search"
              maxLength={200}
              defaultValue={query.q ?? ""}
              placeholder="relay, crossbar, outlet…"
              aria-describedby={problems.q ? "problem-q" : undefined}
              className="mt-2 min-h-11 w-full rounded-md border border-rule bg-paper px-3 py-2 text-sm"
            />
            <label className="mt-5 block text-xs font-semibold uppercase tracking-wider text-ink-soft" htmlFor="vehicle">
              Vehicle
            </label>
            <select
              id="vehicle"
              name="vehicle"
              defaultValue={selectedVehicle}
              className="mt-2 min-h-11 w-full rounded-md border border-rule bg-paper px-3 py-2 text-sm"
            >
              <option value="">Any vehicle</option>
              {vehicles.map((v) => (
                <option key={v.value} value={v.value}>
                  {v.label}
                </option>
              ))}
            </select>
            {variantChoices.length ? (
              <>
                <label className="mt-5 block text-xs font-semibold uppercase tracking-wider text-ink-soft" htmlFor="for">
                  Your variant
                </label>
                <select
                  id="for"
                  name="for"
                  defaultValue={readerVariant?.variantId ?? ""}
                  className="mt-2 min-h-11 w-full rounded-md border border-rule bg-paper px-3 py-2 text-sm"
                >
                  <option value="">Not chosen</option>
                  {variantChoices.map((v) => (
                    <option key={v.id} value={v.id}>
                      {v.name}
                    </option>
                  ))}
                </select>
              </>
            ) : query.for !== undefined ? (
              <input type="hidden" name="for" value={query.for} />
            ) : null}
            {readerVariant ? (
              <label className="mt-3 flex min-h-11 items-center gap-2 text-sm">
                <input
                  type="checkbox"
                  name="fits"
                  value={readerVariant.variantId}
                  defaultChecked={query.fits !== undefined}
                  className="h-5 w-5 accent-spruce-700"
                />
                <span>
                  Fits my vehicle only <span className="text-ink-soft">({readerVariant.label})</span>
                </span>
              </label>
            ) : null}
            <label className="mt-5 block text-xs font-semibold uppercase tracking-wider text-ink-soft" htmlFor="year">
              Model year
            </label>
            <input
              id="year"
              name="year"
              type="number"
              inputMode="numeric"
              min={1}
              max={9999}
              defaultValue={yearText}
              placeholder="e.g. 2021"
              aria-invalid={problems.year ? true : undefined}
              aria-describedby={problems.year ? "problem-year" : undefined}
              className={`mt-2 min-h-11 w-full rounded-md border bg-paper px-3 py-2 text-sm ${problems.year ? "border-z-danger" : "border-rule"}`}
            />
            <FacetGroup
              legend="Powertrain"
              name="powertrain"
              values={POWERTRAINS}
              labels={POWERTRAIN_LABELS}
              counts={facets.powertrain}
              selected={query.powertrain}
            />
            <FacetGroup
              legend="Drivetrain"
              name="drivetrain"
              values={DRIVETRAINS}
              counts={facets.drivetrain}
              selected={query.drivetrain}
            />
            <FacetGroup
              legend="Category"
              name="category"
              values={CATEGORIES}
              labels={CATEGORY_LABELS}
              counts={facets.category}
              selected={query.category}
            />
            <label className="mt-5 block text-xs font-semibold uppercase tracking-wider text-ink-soft" htmlFor="difficulty">
              Difficulty
            </label>
            <select
              id="difficulty"
              name="difficulty"
              defaultValue={query.difficulty ?? ""}
              className="mt-2 min-h-11 w-full rounded-md border border-rule bg-paper px-3 py-2 text-sm"
            >
              <option value="">Any difficulty</option>
              {[1, 2, 3, 4, 5].map((d) => (
                <option key={d} value={d}>
                  {d} · {DIFFICULTY_LABELS[d]} · {guidesCount(facets.difficulty[d] ?? 0)}
                </option>
              ))}
            </select>
            <div className="mt-6 flex gap-2">
              <button
                type="submit"
                className="min-h-11 flex-1 rounded-md bg-spruce-800 px-3 py-2 text-sm font-semibold text-paper hover:bg-spruce-700"
              >
                Apply filters
              </button>
              <Link
                to="/"
                preventScrollReset
                className="inline-flex min-h-11 items-center rounded-md border border-rule px-3 py-2 text-sm text-ink-soft hover:bg-paper-deep"
              >
                Clear
              </Link>
            </div>
          </Form>
        </details>

        <section aria-live="polite" aria-busy={busy} className={`min-w-0 ${busy ? "opacity-60 transition-opacity" : ""}`}>
          {notices.length ? (
            <div className="mb-4 rounded-md border-l-4 border-brass-500 bg-brass-50 px-4 py-3 text-sm text-ink" role="status">
              {notices.map(([field, message]) => (
                <p key={field} id={`problem-${field}`}>
                  {message}
                </p>
              ))}
            </div>
          ) : null}
          <div className="flex flex-wrap items-center justify-between gap-2">
            <p className="text-sm text-ink-soft">
              {total === 0 ? "No published guide matches these filters." : `${total} ${total === 1 ? "guide" : "guides"}`}
            </p>
            <div className="flex items-center gap-2">
              <label htmlFor="sort" className="text-sm text-ink-soft">
                Order
              </label>
              <select
                id="sort"
                name="sort"
                form="library-filters"
                key={filters.formKey}
                defaultValue={query.sort ?? ""}
                onChange={(event) => filters.apply(event.currentTarget.form)}
                className="min-h-11 rounded-md border border-rule bg-white px-3 py-2 text-sm"
              >
                <option value="">{query.q ? "Best match first" : "Newest first"}</option>
                {(Object.keys(SORT_LABELS) as LibrarySort[])
                  .filter((sort) => sort !== "newest" || query.q)
                  .map((sort) => (
                    <option key={sort} value={sort}>
                      {SORT_LABELS[sort]}
                    </option>
                  ))}
              </select>
              {scripted ? null : (
                <button
                  type="submit"
                  form="library-filters"
                  className="min-h-11 rounded-md border border-rule px-3 py-2 text-sm text-ink-soft hover:bg-paper-deep"
                >
                  Sort
                </button>
              )}
            </div>
          </div>
          {total === 0 && relax.length ? (
            <div className="mt-3 rounded-md border border-rule bg-white px-4 py-3 text-sm">
              <p className="text-ink">Leave out one filter to see more:</p>
              <ul className="mt-1">
                {relax.map((r) => (
                  <li key={r.field}>
                    <Link to={r.href} className="inline-flex min-h-11 items-center font-semibold text-spruce-800 underline">
                      Without the {FILTER_NAMES[r.field]} filter: {guidesCount(r.total)}
                    </Link>
                  </li>
                ))}
              </ul>
            </div>
          ) : null}
          {problems.page ? (
            <p className="mt-3 rounded-md border-l-4 border-brass-500 bg-brass-50 px-4 py-3 text-sm text-ink" id="problem-page">
              {problems.page}{" "}
              <Link to={libraryHref(query, pages)} className="font-semibold text-spruce-800 underline">
                Go to page {pages}, the last one
              </Link>
              .
            </p>
          ) : null}
          <ul className="mt-3 space-y-4">
            {guides.map((g) => (
              <li key={g.slug}>
                <article className="group rounded-xl border border-rule bg-white p-4 shadow-sm transition hover:border-spruce-200 hover:shadow-md sm:p-5">
                  <div className="flex flex-wrap items-center gap-2 text-xs font-medium">
                    <span className="rounded-full bg-spruce-50 px-2.5 py-1 text-spruce-800">
                      {CATEGORY_LABELS[g.category as keyof typeof CATEGORY_LABELS]}
                    </span>
                    <span className="rounded-full bg-paper-deep px-2.5 py-1 text-ink-soft">
                      {DIFFICULTY_LABELS[g.difficulty]} · {g.difficulty}/5
                    </span>
                    <span className="rounded-full bg-paper-deep px-2.5 py-1 text-ink-soft">about {formatMinutes(g.minutes)}</span>
                  </div>
                  <h2 className="mt-3 font-serif text-xl font-semibold leading-snug text-spruce-900 sm:text-2xl">
                    <Link to={`/guides/${g.slug}`} className="hover:underline" prefetch="intent">
                      {g.highlight ? (
                        // Escaped by markedHtml: only the <mark> around matched words is markup.
                        // biome-ignore lint/security/noDangerouslySetInnerHtml: escaped text with <mark> only
                        <span dangerouslySetInnerHTML={{ __html: g.highlight.title }} />
                      ) : (
                        g.title
                      )}
                    </Link>
                  </h2>
                  {g.highlight ? (
                    <>
                      {/* biome-ignore lint/security/noDangerouslySetInnerHtml: escaped text with <mark> only */}
                      <p className="search-marks mt-2 text-ink-soft" dangerouslySetInnerHTML={{ __html: g.highlight.summary }} />
                      {g.highlight.steps ? (
                        <p className="search-marks mt-2 border-l-2 border-rule pl-3 text-sm text-ink-soft">
                          <span className="font-medium text-ink">In the steps: </span>
                          {/* biome-ignore lint/security/noDangerouslySetInnerHtml: escaped text with <mark> only */}
                          <span dangerouslySetInnerHTML={{ __html: g.highlight.steps }} />
                        </p>
                      ) : null}
                    </>
                  ) : (
                    <p className="mt-2 text-ink-soft">{g.summary}</p>
                  )}
                  {g.vehicleFit && readerVariant ? <VehicleFit fit={g.vehicleFit} label={readerVariant.label} /> : null}
                  <FitmentSummary rows={g.fitment} />
                  <p className="mt-3 text-sm text-ink-soft">by {g.author}</p>
                </article>
              </li>
            ))}
          </ul>
          <Pager page={page} pages={pages} href={(n) => libraryHref(query, n)} className="mt-6" />
          <div className="mt-8">
            <SafetyNotice compact />
          </div>
        </section>
      </div>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/error-page";
