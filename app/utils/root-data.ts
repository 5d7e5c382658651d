import { useRouteLoaderData } from "react-router";
import type { Permission } from "./permissions";
import type { Role } from "./vocab";

/** What the root loader gives every screen: the signed-in member and what they may do. */
export type RootData = {
  user: { id: number; name: string; email: string; role: Role } | null;
  permissions: Permission[];
  devInbox: boolean;
};

export function useRootData() {
  return useRouteLoaderData<RootData>("root");
}
