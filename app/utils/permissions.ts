import type { Role } from "./vocab";

/** Every permission string the server checks, and the roles that hold it: the one place they are mapped. */
const READER = ["read:guide:published", "save:vehicle:own", "manage:checklist:own", "report:fitment", "comment:guide"] as const;
const AUTHOR = [...READER, "create:guide", "update:guide:own", "submit:guide:own", "upload:media"] as const;
const EDITOR = [
  ...AUTHOR,
  "read:revision:any",
  "review:revision:any",
  "signoff:caution:any",
  "publish:guide:any",
  "unpublish:guide:any",
] as const;
const ADMIN = [...EDITOR, "manage:users", "manage:catalogue", "read:audit"] as const;

export type Permission = (typeof ADMIN)[number];

export const ROLE_PERMISSIONS: Record<Role, readonly Permission[]> = {
  reader: READER,
  author: AUTHOR,
  editor: EDITOR,
  admin: ADMIN,
};

export function permissionsFor(role: Role): readonly Permission[] {
  return ROLE_PERMISSIONS[role];
}

export function can(user: { role: Role } | null | undefined, permission: Permission): boolean {
  return !!user && ROLE_PERMISSIONS[user.role].includes(permission);
}
