import { Form, Link, useNavigation, useSubmit } from "react-router";
import { FitmentSummary } from "~/components/fitment";
import { SafetyNotice } from "~/components/chrome";
import { formatMinutes } from "~/utils/format";
import { getDb } from "~/db/client.server";
import { getCatalogue, yearsLabel } from "~/models/catalogue.server";
import { listPublishedGuides, parseLibraryQuery } from "~/models/library.server";
import { CATEGORIES, CATEGORY_LABELS, DIFFICULTY_LABELS, DRIVETRAINS, POWERTRAIN_LABELS, POWERTRAINS } from "~/utils/vocab";
import { Pager } from "~/components/pager";
import type { Route } from "./+types/library";

export const meta: Route.MetaFunction = () => [
  { title: "Torqueleaf · Reviewed install guides for vehicle accessories" },
  {
    name: "description",
    content:
      "Step-by-step install guides for lamps, outlets, racks and skid plates, filtered by your exact vehicle and powertrain, with checked fuse, wire and torque values.",
  },
];

export async function loader({ request }: Route.LoaderArgs) {
  const params = new URL(request.url).searchParams;
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
  const [result, catalogue] = await Promise.all([listPublishedGuides(db, query), getCatalogue(db)]);
  const vehicles = catalogue.flatMap((make) =>
    make.models.flatMap((model) => [
      { value: `${make.slug}.${model.slug}`, label: `${make.name} ${model.name} (all years)` },
      ...model.generations.map((g) => {
        const value = `${make.slug}.${model.slug}.${g.slug}`;
        const count = result.facets.vehicle[value] ?? 0;
        return { value, label: `${make.name} ${model.name} ${g.name} (${yearsLabel(g.firstYear, g.lastYear)}) · ${count}` };
      }),
    ]),
  );
  const selectedVehicle = [query.make, query.model, query.generation].filter(Boolean).join(".");
  return { ...result, query, vehicles, selectedVehicle };
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
      <div className="mt-2 space-y-1">
        <label className="flex items-center gap-2 text-sm">
          <input type="radio" name={name} value="" defaultChecked={!selected} className="accent-spruce-700" />
          Any
        </label>
        {values.map((value) => (
          <label key={value} className="flex items-center gap-2 text-sm">
            <input type="radio" name={name} value={value} defaultChecked={selected === value} className="accent-spruce-700" />
            <span className="flex-1">{labels ? labels[value] : value}</span>
            <span className="rounded-full bg-paper-deep px-2 text-xs tabular-nums text-ink-soft" title="Matching guides">
              {counts[value] ?? 0}
            </span>
          </label>
        ))}
      </div>
    </fieldset>
  );
}

export default function Library({ loaderData }: Route.ComponentProps) {
  const { guides, total, page, pageSize, facets, query, vehicles, selectedVehicle } = loaderData;
  const submit = useSubmit();
  const navigation = useNavigation();
  const busy = navigation.state === "loading" && navigation.location.pathname === "/";
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const pageLink = (n: number) => {
    const params = new URLSearchParams();
    for (const [k, v] of Object.entries(query)) if (v !== undefined && k !== "page") params.set(k, String(v));
    params.set("page", String(n));
    return `/?${params}`;
  };

  return (
    <div className="mx-auto max-w-6xl px-6 py-10">
      <header className="max-w-3xl">
        <h1 className="font-serif text-4xl font-semibold tracking-tight text-spruce-900 md:text-5xl">
          Install guides you can check before you drill
        </h1>
        <p className="mt-3 text-lg text-ink-soft">
          Written by owners and shop technicians, reviewed by editors. Filter by your vehicle and powertrain: a hybrid with its 12
          V battery in the cargo area needs a different wire run than the same model with a gasoline engine.
        </p>
      </header>

      <div className="mt-8 grid gap-8 lg:grid-cols-[17rem_1fr]">
        <Form
          method="get"
          role="search"
          aria-label="Filter guides"
          className="no-print h-fit rounded-xl border border-rule bg-white p-5 shadow-sm"
          onChange={(e) => submit(e.currentTarget, { preventScrollReset: true })}
        >
          <label className="block text-xs font-semibold uppercase tracking-wider text-ink-soft" htmlFor="q">
            Search
          </label>
          <input
            id="q"
            name="q"
            type="search"
            defaultValue={query.q ?? ""}
            placeholder="relay, crossbar, outlet…"
            className="mt-2 w-full rounded-md border border-rule bg-paper px-3 py-2 text-sm"
          />
          <label className="mt-5 block text-xs font-semibold uppercase tracking-wider text-ink-soft" htmlFor="vehicle">
            Vehicle
          </label>
          <select
            id="vehicle"
            name="vehicle"
            defaultValue={selectedVehicle}
            className="mt-2 w-full rounded-md border border-rule bg-paper px-3 py-2 text-sm"
          >
            <option value="">Any vehicle</option>
            {vehicles.map((v) => (
              <option key={v.value} value={v.value}>
                {v.label}
              </option>
            ))}
          </select>
          <label className="mt-5 block text-xs font-semibold uppercase tracking-wider text-ink-soft" htmlFor="year">
            Model year
          </label>
          <input
            id="year"
            name="year"
            type="number"
            inputMode="numeric"
            min={1950}
            max={2100}
            defaultValue={query.year ?? ""}
            placeholder="e.g. 2021"
            className="mt-2 w-full rounded-md border border-rule bg-paper px-3 py-2 text-sm"
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
            className="mt-2 w-full rounded-md border border-rule bg-paper px-3 py-2 text-sm"
          >
            <option value="">Any difficulty</option>
            {[1, 2, 3, 4, 5].map((d) => (
              <option key={d} value={d}>
                {d} · {DIFFICULTY_LABELS[d]} · {facets.difficulty[d] ?? 0}
              </option>
            ))}
          </select>
          <div className="mt-6 flex gap-2">
            <button
              type="submit"
              className="flex-1 rounded-md bg-spruce-800 px-3 py-2 text-sm font-semibold text-paper hover:bg-spruce-700"
            >
              Apply filters
            </button>
            <Link to="/" className="rounded-md border border-rule px-3 py-2 text-sm text-ink-soft hover:bg-paper-deep">
              Clear
            </Link>
          </div>
        </Form>

        <section aria-live="polite" aria-busy={busy} className={busy ? "opacity-60 transition-opacity" : ""}>
          <p className="text-sm text-ink-soft">
            {total === 0 ? "No published guide matches these filters." : `${total} ${total === 1 ? "guide" : "guides"}`}
          </p>
          <ul className="mt-3 space-y-4">
            {guides.map((g) => (
              <li key={g.slug}>
                <article className="group rounded-xl border border-rule bg-white p-5 shadow-sm transition hover:border-spruce-200 hover:shadow-md">
                  <div className="flex flex-wrap items-center gap-2 text-xs font-medium">
                    <span className="rounded-full bg-spruce-50 px-2.5 py-1 text-spruce-800">
                      {CATEGORY_LABELS[g.category as keyof typeof CATEGORY_LABELS]}
                    </span>
                    <span className="rounded-full bg-paper-deep px-2.5 py-1 text-ink-soft">
                      {DIFFICULTY_LABELS[g.difficulty]} · {g.difficulty}/5
                    </span>
                    <span className="rounded-full bg-paper-deep px-2.5 py-1 text-ink-soft">about {formatMinutes(g.minutes)}</span>
                  </div>
                  <h2 className="mt-3 font-serif text-2xl font-semibold leading-snug text-spruce-900">
                    <Link to={`/guides/${g.slug}`} className="hover:underline" prefetch="intent">
                      {g.title}
                    </Link>
                  </h2>
                  <p className="mt-2 text-ink-soft">{g.summary}</p>
                  <FitmentSummary rows={g.fitment} />
                  <p className="mt-3 text-sm text-ink-soft">by {g.author}</p>
                </article>
              </li>
            ))}
          </ul>
          <Pager page={page} pages={pages} href={pageLink} className="mt-6" />
          <div className="mt-8">
            <SafetyNotice compact />
          </div>
        </section>
      </div>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/error-page";
