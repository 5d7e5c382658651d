import { forbidden, unauthorized } from "./errors";
import type { Role } from "./vocab";

/** Every permission string the server checks, and the roles that hold it: the one place they are mapped. */
const READER = ["read:guide:published", "save:vehicle:own", "manage:checklist:own", "report:fitment", "comment:guide"] as const;
const AUTHOR = [...READER, "create:guide", "update:guide:own", "submit:guide:own", "upload:media", "attach:media:own"] as const;
const EDITOR = [
  ...AUTHOR,
  "read:revision:any",
  "review:revision:any",
  "signoff:caution:any",
  "publish:guide:any",
  "unpublish:guide:any",
  "hide:fitment-report:any",
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

/** Whoever acts: the signed-in user, or the seed acting as a demo account. */
export type Actor = { id: number; role: Role };

export function can(user: { role: Role } | null | undefined, permission: Permission): boolean {
  return !!user && ROLE_PERMISSIONS[user.role].includes(permission);
}

type GuideLike = { authorId: number };
type RevisionLike = { guide: GuideLike };

/**
 * Actions checked against an object, and the object each one needs: its owner decides `:own`
 * (guide.authorId, revision.guide.authorId, media.ownerId, checklist.userId). Actions without an
 * object take none.
 */
type Subjects = {
  "create:guide": undefined;
  "upload:media": undefined;
  "update:guide": GuideLike;
  "submit:guide": GuideLike;
  "read:revision": RevisionLike;
  "review:revision": RevisionLike;
  "signoff:caution": RevisionLike;
  "publish:guide": GuideLike;
  "unpublish:guide": GuideLike;
  "attach:media": { ownerId: number };
  "manage:checklist": { userId: number };
  "save:vehicle": { userId: number };
};

export type Action = keyof Subjects;
type SubjectArgs<A extends Action> = Subjects[A] extends undefined ? [] : [subject: Subjects[A]];

function ownerOf(subject: unknown): number | null {
  if (!subject || typeof subject !== "object") return null;
  const s = subject as { authorId?: number; ownerId?: number; userId?: number; guide?: GuideLike };
  return s.authorId ?? s.ownerId ?? s.userId ?? s.guide?.authorId ?? null;
}

/** Editors never review, sign off or publish their own work: a second pair of eyes is the point of review. */
const NOT_ON_OWN: ReadonlySet<Action> = new Set<Action>(["review:revision", "signoff:caution", "publish:guide"]);

const REFUSALS: Partial<Record<Action, string>> = {
  "update:guide": "Only the guide's author can change this draft.",
  "submit:guide": "Only the guide's author can submit this draft.",
  "attach:media": "This photo belongs to another account.",
  "manage:checklist": "This checklist belongs to another account.",
  "save:vehicle": "This vehicle belongs to another account.",
};

function decide<A extends Action>(user: Actor | null | undefined, action: A, subject: Subjects[A] | undefined) {
  if (!user) return { ok: false as const, message: "Sign in to continue." };
  const permissions = ROLE_PERMISSIONS[user.role];
  const owner = ownerOf(subject);
  const own = owner !== null && owner === user.id;
  if (own && NOT_ON_OWN.has(action)) return { ok: false as const, message: "Editors cannot review their own guides." };
  const allowed =
    permissions.includes(action as Permission) ||
    permissions.includes(`${action}:any` as Permission) ||
    (own && permissions.includes(`${action}:own` as Permission));
  if (allowed) return { ok: true as const };
  return { ok: false as const, message: REFUSALS[action] ?? "Your account does not have access to this." };
}

/** Whether `user` may do `action` on `subject`, resolving `:own` against the subject's owner. */
export function canOn<A extends Action>(user: Actor | null | undefined, action: A, ...subject: SubjectArgs<A>): boolean {
  return decide(user, action, subject[0]).ok;
}

/** As `canOn`, but throws the 403 the API and pages show when the answer is no. */
export function assertCan<A extends Action>(user: Actor | null | undefined, action: A, ...subject: SubjectArgs<A>): void {
  if (!user) throw unauthorized();
  const verdict = decide(user, action, subject[0]);
  if (!verdict.ok) throw forbidden(verdict.message);
}
