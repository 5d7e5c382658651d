import { eq } from "drizzle-orm";
import type { Db } from "~/db/client.server";
import { users } from "~/db/schema";
import { hashPassword } from "~/services/password.server";
import type { Role } from "~/utils/vocab";

export const normalizeEmail = (email: string) => email.trim().toLowerCase();

export async function findUserByEmail(db: Db, email: string) {
  return db.query.users.findFirst({ where: eq(users.email, normalizeEmail(email)) });
}

export async function getUserById(db: Db, id: number) {
  return db.query.users.findFirst({ where: eq(users.id, id) });
}

export async function createUser(
  db: Db,
  input: { email: string; name: string; password: string | null; role?: Role; verified?: boolean; bio?: string | null },
) {
  const [user] = await db
    .insert(users)
    .values({
      email: normalizeEmail(input.email),
      name: input.name.trim(),
      passwordHash: input.password ? await hashPassword(input.password) : null,
      role: input.role ?? "reader",
      bio: input.bio ?? null,
      emailVerifiedAt: input.verified ? new Date() : null,
      termsAcceptedAt: input.role && input.role !== "reader" ? new Date() : null,
    })
    .returning();
  return user;
}
