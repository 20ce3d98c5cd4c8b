import "server-only";
import { and, asc, count, eq, sql } from "drizzle-orm";
import { getDb, type DbOrTx } from "@/db/client";
import { users, type Role, type User } from "@/db/schema";

export function normaliseEmail(email: string): string {
  return email.trim().toLowerCase();
}

export function findUserByEmail(email: string, db: DbOrTx = getDb()): User | undefined {
  return db.select().from(users).where(eq(users.email, normaliseEmail(email))).get();
}

export function findUserById(id: number, db: DbOrTx = getDb()): User | undefined {
  return db.select().from(users).where(eq(users.id, id)).get();
}

export type UserListRow = Pick<User, "id" | "email" | "name" | "role" | "active" | "lastSignInAt" | "createdAt" | "signInMethod"> & {
  hasPassword: boolean;
  /** Linked to an identity at the institution's provider (signed in with it at least once). */
  ssoLinked: boolean;
};

export function listUsers(db: DbOrTx = getDb()): UserListRow[] {
  return db
    .select({
      id: users.id,
      email: users.email,
      name: users.name,
      role: users.role,
      active: users.active,
      lastSignInAt: users.lastSignInAt,
      createdAt: users.createdAt,
      hasPassword: sql<boolean>`${users.passwordHash} is not null`.mapWith(Boolean),
      signInMethod: users.signInMethod,
      ssoLinked: sql<boolean>`${users.ssoSubject} is not null`.mapWith(Boolean),
    })
    .from(users)
    .orderBy(asc(users.name))
    .all();
}

export function countActiveAdmins(db: DbOrTx = getDb()): number {
  const row = db
    .select({ n: count() })
    .from(users)
    .where(and(eq(users.role, "admin" satisfies Role), eq(users.active, true)))
    .get();
  return row?.n ?? 0;
}

export function listActiveUsersByRole(role: Role, db: DbOrTx = getDb()) {
  return db
    .select({ id: users.id, email: users.email, name: users.name })
    .from(users)
    .where(and(eq(users.role, role), eq(users.active, true)))
    .orderBy(asc(users.name))
    .all();
}
