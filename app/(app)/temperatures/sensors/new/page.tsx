import type { Metadata } from "next";
import Link from "next/link";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePagePermission } from "@/lib/auth/page";
import { sensorLocationOptions } from "@/lib/temperatures/sensors";
import { SensorCreateForm } from "../../sensor-forms";

export const metadata: Metadata = { title: "Register a sensor" };

export default async function NewSensorPage({ searchParams }: { searchParams: Promise<{ location?: string }> }) {
  await requirePagePermission("sensors.write");
  const locations = sensorLocationOptions();
  const wanted = (await searchParams).location;
  const location = locations.some((o) => o.value === wanted) ? wanted : undefined;
  return (
    <div className="space-y-5">
      <p className="text-sm">
        <Link href="/temperatures" className="text-accent-700 hover:underline">
          ← Temperatures
        </Link>
      </p>
      <PageHeader
        title="Register a sensor"
        description="A sensor is a temperature logger in one room or one storage unit, known by its device id. The location's set range and excursion threshold apply to its readings."
      />
      <Card className="max-w-3xl">
        <SensorCreateForm locations={locations} location={location} />
      </Card>
    </div>
  );
}
