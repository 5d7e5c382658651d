import { Form, useLocation } from "react-router";
import { z } from "zod";
import { FailureNotice, Notice } from "~/components/form";
import { VehiclePicker } from "~/components/vehicle-picker";
import { getDb } from "~/db/client.server";
import { NICKNAME_MAX } from "~/models/reader-limits";
import { pickerOptions } from "~/models/vehicle-picker.server";
import {
  deleteVehicle,
  findSameVehicle,
  listVehicles,
  MAX_SAVED_VEHICLES,
  makeCurrent,
  pickedVehicle,
  saveVehicle,
  vehicleIdField,
  vehicleInputSchema,
} from "~/models/vehicles.server";
import { requireUser } from "~/services/auth/guards.server";
import { clearedVehicleCookieHeader } from "~/services/vehicle-cookie.server";
import { failureOf } from "~/utils/forms";
import { formHeaders, handleForm, redirectWithFlash } from "~/utils/forms.server";
import type { Route } from "./+types/me.vehicles";

export const meta: Route.MetaFunction = () => [
  { title: "My vehicles · Torqueleaf" },
  { name: "description", content: "The vehicles you keep, and the one guides are checked against." },
  { name: "robots", content: "noindex" },
];

export async function loader(args: Route.LoaderArgs) {
  const user = await requireUser(args);
  const db = await getDb();
  const url = new URL(args.request.url);
  const [vehicles, picker, picked] = await Promise.all([
    listVehicles(db, user.id),
    pickerOptions(db, url.searchParams),
    pickedVehicle(args.request, db),
  ]);
  // A vehicle picked before signing in is offered once, unless it is saved already.
  const offer = picked?.year && !(await findSameVehicle(db, user.id, picked.variantId, picked.year)) ? picked : null;
  return { vehicles, picker, offer, max: MAX_SAVED_VEHICLES };
}

const intentSchema = z.discriminatedUnion(
  "intent",
  [
    z.object({ intent: z.literal("add"), ...vehicleInputSchema.omit({ current: true }).shape }),
    z.object({ intent: z.literal("current"), vehicleId: vehicleIdField }),
    z.object({ intent: z.literal("delete"), vehicleId: vehicleIdField }),
    z.object({ intent: z.literal("save-picked") }),
    z.object({ intent: z.literal("dismiss-picked") }),
  ],
  { error: "Choose one of the actions on this page." },
);

export async function action(args: Route.ActionArgs) {
  const user = await requireUser(args);
  return handleForm(args.request, intentSchema, async (input) => {
    const db = await getDb();
    switch (input.intent) {
      case "add":
        await saveVehicle(db, user, input);
        return redirectWithFlash("/me/vehicles", { tone: "success", text: "The vehicle is saved." });
      case "current":
        await makeCurrent(db, user, input.vehicleId);
        return redirectWithFlash("/me/vehicles", { tone: "success", text: "Guides are now checked against that vehicle." });
      case "delete":
        await deleteVehicle(db, user, input.vehicleId);
        return redirectWithFlash("/me/vehicles", { tone: "success", text: "The vehicle is deleted." });
      case "save-picked": {
        const picked = await pickedVehicle(args.request, db);
        const clear = { headers: { "Set-Cookie": await clearedVehicleCookieHeader() } };
        if (!picked?.year) return redirectWithFlash("/me/vehicles", { tone: "info", text: "No picked vehicle to save." }, clear);
        const same = await findSameVehicle(db, user.id, picked.variantId, picked.year);
        if (same) await makeCurrent(db, user, same.id);
        else await saveVehicle(db, user, { variantId: picked.variantId, year: picked.year, nickname: "", current: true });
        return redirectWithFlash(
          "/me/vehicles",
          { tone: "success", text: "The vehicle you picked is saved and current." },
          clear,
        );
      }
      case "dismiss-picked":
        return redirectWithFlash(
          "/me/vehicles",
          { tone: "info", text: "The picked vehicle is forgotten." },
          { headers: { "Set-Cookie": await clearedVehicleCookieHeader() } },
        );
    }
  });
}

export const headers = formHeaders;

const buttonQuiet =
  "min-h-11 rounded-md border border-rule bg-white px-4 py-2 text-sm font-semibold text-spruce-800 hover:bg-paper-deep";

export default function MyVehicles({ loaderData, actionData }: Route.ComponentProps) {
  const { vehicles, picker, offer, max } = loaderData;
  const failure = failureOf(actionData);
  const { pathname, search } = useLocation();
  return (
    <div className="mx-auto max-w-3xl px-4 py-8 sm:px-6 sm:py-10">
      <h1 className="font-serif text-3xl font-semibold text-spruce-900">My vehicles</h1>
      <p className="mt-2 text-ink-soft">
        Guides say whether they fit your current vehicle. Fitment is the author's and readers' account: check the vehicle maker's
        instructions for your exact vehicle before you start.
      </p>

      {failure ? (
        <div className="mt-6">
          <FailureNotice failure={failure} focusOn={actionData} />
        </div>
      ) : null}

      {offer ? (
        <div className="mt-6">
          <Notice tone="info">
            <p>
              Before you signed in you picked <strong>{offer.label}</strong>. Save it to My vehicles?
            </p>
            <div className="mt-3 flex flex-wrap gap-2">
              <Form method="post">
                <input type="hidden" name="intent" value="save-picked" />
                <button
                  type="submit"
                  className="min-h-11 rounded-md bg-spruce-800 px-4 py-2 font-semibold text-paper hover:bg-spruce-700"
                >
                  Save it
                </button>
              </Form>
              <Form method="post">
                <input type="hidden" name="intent" value="dismiss-picked" />
                <button type="submit" className={buttonQuiet}>
                  No, forget it
                </button>
              </Form>
            </div>
          </Notice>
        </div>
      ) : null}

      <section aria-labelledby="saved-heading" className="mt-8">
        <h2 id="saved-heading" className="font-serif text-xl font-semibold text-spruce-900">
          Saved vehicles
        </h2>
        {vehicles.length === 0 ? (
          <p className="mt-2 text-ink-soft">You have saved no vehicle yet. The first one you add becomes current.</p>
        ) : (
          <ul className="mt-3 divide-y divide-rule rounded-lg border border-rule bg-white">
            {vehicles.map((v) => (
              <li key={v.id} className="flex flex-wrap items-center gap-3 px-4 py-3">
                <div className="min-w-0 flex-1 basis-60">
                  <p className="break-words font-semibold">{v.nickname || v.label}</p>
                  {v.nickname ? <p className="break-words text-sm text-ink-soft">{v.label}</p> : null}
                  {v.current ? (
                    <p className="mt-1 inline-block rounded-md bg-spruce-50 px-2 py-0.5 text-xs font-semibold text-spruce-800">
                      Current vehicle
                    </p>
                  ) : null}
                </div>
                <div className="flex flex-wrap gap-2">
                  {v.current ? null : (
                    <Form method="post">
                      <input type="hidden" name="intent" value="current" />
                      <input type="hidden" name="vehicleId" value={v.id} />
                      <button type="submit" className={buttonQuiet}>
                        Make current<span className="sr-only">: {v.nickname || v.label}</span>
                      </button>
                    </Form>
                  )}
                  <Form method="post">
                    <input type="hidden" name="intent" value="delete" />
                    <input type="hidden" name="vehicleId" value={v.id} />
                    <button type="submit" className={`${buttonQuiet} text-z-danger`}>
                      Delete<span className="sr-only">: {v.nickname || v.label}</span>
                    </button>
                  </Form>
                </div>
              </li>
            ))}
          </ul>
        )}
      </section>

      <section aria-labelledby="add-heading" id="vehicle-picker" className="mt-10 scroll-mt-4">
        <h2 id="add-heading" className="font-serif text-xl font-semibold text-spruce-900">
          Add a vehicle
        </h2>
        {vehicles.length >= max ? (
          <p className="mt-2 text-ink-soft">You keep {max} vehicles, the most there is room for. Delete one to add another.</p>
        ) : (
          <div className="mt-3 rounded-lg border border-rule bg-white p-4">
            <VehiclePicker
              options={picker}
              stepsAction={`${pathname}#vehicle-picker`}
              saveAction={`${pathname}${search}`}
              submitLabel="Save vehicle"
              idPrefix="add"
            >
              <input type="hidden" name="intent" value="add" />
              <div>
                <label htmlFor="add-nickname" className="block text-sm font-semibold text-ink">
                  Nickname <span className="font-normal text-ink-soft">(optional)</span>
                </label>
                <input
                  id="add-nickname"
                  name="nickname"
                  maxLength={NICKNAME_MAX}
                  defaultValue={failure?.values?.nickname ?? ""}
                  aria-invalid={failure?.fields?.nickname ? true : undefined}
                  className="mt-1 min-h-11 w-full rounded-md border border-rule bg-paper px-3 py-2"
                />
              </div>
            </VehiclePicker>
          </div>
        )}
      </section>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/error-page";
