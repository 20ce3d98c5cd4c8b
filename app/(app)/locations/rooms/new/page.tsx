import type { Metadata } from "next";
import Link from "next/link";
import { Card, PageHeader } from "@/components/ui/card";
import { activeUserOptions, siteOptions } from "@/db/queries/options";
import { requirePagePermission } from "@/lib/auth/page";
import { RoomForm } from "../../location-forms";

export const metadata: Metadata = { title: "Add a room" };

export default async function NewRoomPage() {
  await requirePagePermission("locations.write");
  const contacts = activeUserOptions()
    .filter((p) => p.role === "facilities" || p.role === "safety_officer" || p.role === "admin")
    .map((p) => ({ value: String(p.id), label: p.name }));
  return (
    <div className="space-y-5">
      <p className="text-sm">
        <Link href="/locations" className="text-accent-700 hover:underline">
          ← Locations
        </Link>
      </p>
      <PageHeader title="Add a room" description="Its storage units are added on the room's page." />
      <Card>
        <RoomForm mode="create" sites={siteOptions().map((s) => ({ value: String(s.id), label: s.name }))} contacts={contacts} />
      </Card>
    </div>
  );
}
