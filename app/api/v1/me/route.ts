import { NextResponse } from "next/server";
import { route } from "@/lib/http/route";

export const GET = route({ action: "profile.update" }, ({ user }) =>
  NextResponse.json({ user: { id: user.id, email: user.email, name: user.name, role: user.role } }),
);
