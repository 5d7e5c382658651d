import type { Route } from "./+types/api.catalogue";
import { getDb } from "~/db/client.server";
import { readCatalogue } from "~/models/reader-cache.server";
import { publicJson } from "~/utils/http.server";

export async function loader({ request }: Route.LoaderArgs) {
  const makes = await readCatalogue(await getDb());
  return publicJson(request, {
    makes: makes.map((make) => ({
      slug: make.slug,
      name: make.name,
      models: make.models.map((model) => ({
        slug: model.slug,
        name: model.name,
        bodyStyle: model.bodyStyle,
        generations: model.generations.map((g) => ({
          slug: g.slug,
          name: g.name,
          firstYear: g.firstYear,
          lastYear: g.lastYear,
          variants: g.variants.map((v) => ({
            id: v.id,
            key: v.key,
            name: v.name,
            powertrain: v.powertrain,
            drivetrain: v.drivetrain,
            batteryLocation: v.batteryLocation,
            batteryRunM: v.batteryRunM,
          })),
        })),
      })),
    })),
  });
}
