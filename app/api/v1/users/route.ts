import { NextResponse } from "next/server";
import { listUsers } from "@/db/queries/users";
import { clientIp } from "@/lib/http/client-ip";
import { route } from "@/lib/http/route";
import { inviteUserSchema } from "@/lib/users/schemas";
import { inviteUser } from "@/lib/users/service";

export const GET = route({ action: "users.manage" }, () => {
  const data = listUsers().map((u) => ({
    id: u.id,
    email: u.email,
    name: u.name,
    role: u.role,
    active: u.active,
    activated: u.signInMethod === "sso" ? u.ssoLinked : u.hasPassword,
    signInMethod: u.signInMethod,
    lastSignInAt: u.lastSignInAt?.toISOString() ?? null,
    createdAt: u.createdAt.toISOString(),
  }));
  return NextResponse.json({ data, page: 1, pageSize: data.length, total: data.length });
});

/** Invites a person by e-mail; the invitation goes out through the outbox. 429 past the invitation limits. */
export const POST = route({ action: "users.manage", schema: inviteUserSchema }, async ({ request, user, input }) => {
  const invited = await inviteUser(user, input, { clientIp: clientIp(request) });
  return NextResponse.json(
    { user: { id: invited.id, email: invited.email, name: invited.name, role: invited.role, active: invited.active, activated: false, signInMethod: invited.signInMethod } },
    { status: 201 },
  );
});
