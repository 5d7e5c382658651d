import { useRouteLoaderData } from "react-router";
import type { Flash } from "./forms";
import type { Permission } from "./permissions";
import type { Role } from "./vocab";

/** What the root loader gives every screen: the signed-in member and what they may do. */
export type RootData = {
  user: { id: number; name: string; email: string; role: Role } | null;
  permissions: Permission[];
  devInbox: boolean;
  /** The one-time message after a change, shown once above the page. */
  flash: Flash | null;
};

export function useRootData() {
  return useRouteLoaderData<RootData>("root");
}
