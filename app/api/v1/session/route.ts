import { NextResponse } from "next/server";
import { parseInput } from "@/lib/auth/guard";
import { writeSessionCookie } from "@/lib/auth/session";
import { signInWithPassword } from "@/lib/auth/sign-in";
import { clientIp } from "@/lib/http/client-ip";
import { publicRoute, readInput } from "@/lib/http/route";
import { signInSchema } from "@/lib/users/schemas";

/** Signs in with { email, password }; records a session and sets its cookie. 429 with Retry-After past the sign-in limits. */
export const POST = publicRoute(async ({ request }) => {
  const input = parseInput(signInSchema, await readInput(request));
  const user = await signInWithPassword(input.email, input.password, { clientIp: clientIp(request) });
  const response = NextResponse.json({ user: { id: user.id, email: user.email, name: user.name, role: user.role } });
  await writeSessionCookie(request, response, user);
  return response;
});

/** Signs out: deletes the session at once and clears the cookie. Answers 204 whether or not a session existed. */
export const DELETE = publicRoute(async ({ request }) => {
  const response = new NextResponse(null, { status: 204 });
  await writeSessionCookie(request, response, null);
  return response;
});
