import { getUser } from "~/services/auth/session.server";
import { permissionsFor } from "~/utils/permissions";
import type { Route } from "./+types/api.me";

/** Who is signed in, with role and permissions; `{ user: null }` for anonymous callers (not an error). */
export async function loader(args: Route.LoaderArgs) {
  const user = await getUser(args);
  return Response.json(
    {
      user: user
        ? { id: user.id, email: user.email, name: user.name, role: user.role, permissions: permissionsFor(user.role) }
        : null,
    },
    { headers: { "Cache-Control": "private, no-store" } },
  );
}
