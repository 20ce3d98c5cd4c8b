import { NextResponse } from "next/server";
import { parseInput } from "@/lib/auth/guard";
import { writeSessionCookie } from "@/lib/auth/session";
import { signInWithPassword } from "@/lib/auth/sign-in";
import { publicRoute, readInput } from "@/lib/http/route";
import { signInSchema } from "@/lib/users/schemas";

/** Signs in with { email, password }; sets the session cookie. */
export const POST = publicRoute(async ({ request }) => {
  const input = parseInput(signInSchema, await readInput(request));
  const user = await signInWithPassword(input.email, input.password);
  const response = NextResponse.json({ user: { id: user.id, email: user.email, name: user.name, role: user.role } });
  await writeSessionCookie(request, response, user);
  return response;
});

/** Signs out: clears the session cookie. Answers 204 whether or not a session existed. */
export const DELETE = publicRoute(async ({ request }) => {
  const response = new NextResponse(null, { status: 204 });
  await writeSessionCookie(request, response, null);
  return response;
});
