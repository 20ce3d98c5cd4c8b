/** Builders for integration tests: users, sessions and requests against route handlers. */
import bcrypt from "bcryptjs";
import { sealData } from "iron-session";
import { getDb } from "@/db/client";
import { users, type Role, type User } from "@/db/schema";
import { SESSION_COOKIE } from "@/lib/auth/session";
import { createSession, type SessionMeta } from "@/lib/auth/session-store";

export const TEST_PASSWORD = "correct horse battery staple";

let counter = 0;

export function makeUser(role: Role, overrides: Partial<typeof users.$inferInsert> = {}): User {
  counter += 1;
  return getDb()
    .insert(users)
    .values({
      email: `${role}.${counter}@example.test`,
      name: `Test ${role} ${counter}`,
      role,
      passwordHash: bcrypt.hashSync(TEST_PASSWORD, 4),
      ...overrides,
    })
    .returning()
    .get();
}

/** Records a session for the user, as signing in does, and returns its cookie. */
export async function sessionCookieFor(
  user: Pick<User, "id" | "sessionVersion">,
  meta: SessionMeta = { userAgent: "integration-test", ip: "127.0.0.1" },
  now = Date.now(),
): Promise<string> {
  const sealed = await sealData({ sid: createSession(user, meta, now) }, { password: process.env.SESSION_SECRET! });
  return `${SESSION_COOKIE}=${sealed}`;
}

type Handler = (request: Request, context: { params: Promise<Record<string, string>> }) => Promise<Response>;

export async function call(
  handler: Handler,
  options: { method?: string; path?: string; body?: unknown; cookie?: string; params?: Record<string, string>; headers?: Record<string, string> } = {},
  // eslint-disable-next-line @typescript-eslint/no-explicit-any -- tests read arbitrary JSON bodies
): Promise<{ status: number; body: any; headers: Headers }> {
  const headers: Record<string, string> = { ...options.headers };
  if (options.cookie) headers.cookie = options.cookie;
  if (options.body !== undefined) headers["content-type"] = "application/json";
  const request = new Request(`http://localhost:3999${options.path ?? "/api/v1/test"}`, {
    method: options.method ?? "GET",
    headers,
    body: options.body === undefined ? undefined : typeof options.body === "string" ? options.body : JSON.stringify(options.body),
  });
  const response = await handler(request, { params: Promise.resolve(options.params ?? {}) });
  const text = await response.text();
  return { status: response.status, body: text ? JSON.parse(text) : null, headers: response.headers };
}
