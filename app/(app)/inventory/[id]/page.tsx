import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { AuditTrail } from "@/components/audit-trail";
import { SdsAttachment } from "@/components/sds-attachment";
import { Card, PageHeader } from "@/components/ui/card";
import { FormMessage } from "@/components/ui/form-message";
import { auditTrail } from "@/db/queries/audit";
import { getContainer } from "@/db/queries/containers";
import { activeUserOptions, mixtureOptions, storageUnitOptions } from "@/db/queries/options";
import { requirePagePermission } from "@/lib/auth/page";
import { containerSds } from "@/lib/files/service";
import { scopeFor } from "@/lib/auth/permissions";
import { CONTAINER_KIND_LABELS, CONTAINER_STATE_LABELS } from "@/lib/format/container-labels";
import { formatDateTime, formatQuantity } from "@/lib/format/numbers";
import { idParam } from "@/lib/http/paging";
import { updateContainerAction } from "../actions";
import { ContainerForm } from "../container-form";
import { ContainerStateButtons } from "./container-actions";
import { MoveDialog } from "./move-dialog";
import { PlaceFindings } from "@/app/(app)/locations/place-findings";

export const metadata: Metadata = { title: "Container" };

const isoDate = (d: Date | null) => (d ? d.toISOString().slice(0, 10) : null);

export default async function ContainerPage({ params, searchParams }: { params: Promise<{ id: string }>; searchParams: Promise<{ saved?: string; moveTo?: string }> }) {
  const { user } = await requirePagePermission("inventory.read");
  const id = idParam((await params).id);
  const container = id ? getContainer(id) : null;
  if (!container) notFound();
  const { saved, moveTo } = await searchParams;
  const scope = scopeFor(user.role, "containers.write");
  const mayChange = container.state !== "disposed" && (scope === "all" || (scope === "own" && container.ownerId === user.id));
  const units = mayChange ? storageUnitOptions() : [];

  return (
    <div className="space-y-6">
      <p className="text-sm">
        <Link href="/inventory" className="text-accent-700 hover:underline">
          ← Inventory
        </Link>
      </p>
      <PageHeader
        title={container.label}
        description={
          <span className="tabular">
            {container.substanceName ?? container.mixtureName} · {formatQuantity(container.amount, container.amountUnit)}
            {container.capacity ? ` of ${formatQuantity(container.capacity, container.capacityUnit ?? "")}` : ""} · {CONTAINER_STATE_LABELS[container.state]}
          </span>
        }
      />
      {saved === "created" ? <FormMessage success={`Logged ${container.label}.`} /> : null}

      <div className="grid gap-6 lg:grid-cols-3">
        <Card title="Details" className="lg:col-span-2">
          <dl className="grid gap-x-6 gap-y-3 text-sm sm:grid-cols-2">
            <div>
              <dt className="text-xs text-ink-600">Contents</dt>
              <dd>
                {container.substanceId ? (
                  <Link href={`/substances/${container.substanceId}`} className="text-accent-800 hover:underline">
                    {container.substanceName}
                  </Link>
                ) : (
                  container.mixtureName
                )}
                {container.substanceCas ? <span className="ml-2 font-mono text-xs text-ink-600">CAS {container.substanceCas}</span> : null}
              </dd>
            </div>
            <div>
              <dt className="text-xs text-ink-600">Stored in</dt>
              <dd>
                <Link href={`/locations/rooms/${container.roomId}`} className="text-accent-800 hover:underline">
                  {container.siteName} · {container.roomCode} / {container.unitCode}
                </Link>{" "}
                <span className="text-ink-600">{container.unitName}</span>
              </dd>
            </div>
            <div>
              <dt className="text-xs text-ink-600">Kind</dt>
              <dd>{CONTAINER_KIND_LABELS[container.containerKind]}</dd>
            </div>
            <div>
              <dt className="text-xs text-ink-600">Owner</dt>
              <dd>{container.ownerName ?? "—"}</dd>
            </div>
            <div>
              <dt className="text-xs text-ink-600">Received · opened · expires</dt>
              <dd className="tabular">
                {isoDate(container.receivedAt) ?? "—"} · {isoDate(container.openedAt) ?? "—"} · {isoDate(container.expiresAt) ?? "—"}
              </dd>
            </div>
            <div>
              <dt className="text-xs text-ink-600">Last changed</dt>
              <dd className="tabular">{formatDateTime(container.updatedAt)}</dd>
            </div>
            {container.notes ? (
              <div className="sm:col-span-2">
                <dt className="text-xs text-ink-600">Notes</dt>
                <dd className="whitespace-pre-line">{container.notes}</dd>
              </div>
            ) : null}
          </dl>
        </Card>

        <Card title="Where it has been">
          <ol className="space-y-2 text-sm">
            {container.moves.map((move) => (
              <li key={move.id}>
                <p>
                  {move.fromUnitCode ? `${move.fromRoomCode} / ${move.fromUnitCode} → ` : "Placed in "}
                  {move.toRoomCode} / {move.toUnitCode}
                </p>
                <p className="tabular text-xs text-ink-500">
                  {formatDateTime(move.movedAt)}
                  {move.movedBy ? ` · ${move.movedBy}` : ""}
                </p>
              </li>
            ))}
          </ol>
        </Card>
      </div>

      <PlaceFindings user={user} place={{ kind: "container", containerId: container.id }} />

      <Card title="Safety data sheet">
        <SdsAttachment target={{ kind: "container", id: container.id }} {...containerSds(user, container.id)} />
      </Card>

      {mayChange ? (
        <div className="grid gap-6 lg:grid-cols-3">
          <Card title="Edit" className="lg:col-span-2">
            <ContainerForm
              mode="edit"
              action={updateContainerAction}
              values={{
                id: container.id,
                label: container.label,
                substance: container.substanceId ? { id: container.substanceId, name: container.substanceName ?? "", cas: container.substanceCas } : null,
                mixtureId: container.mixtureId,
                amount: container.amount,
                amountUnit: container.amountUnit,
                capacity: container.capacity,
                capacityUnit: container.capacityUnit,
                containerKind: container.containerKind,
                state: container.state,
                storageUnitId: container.storageUnitId,
                ownerId: container.ownerId,
                receivedAt: isoDate(container.receivedAt),
                openedAt: isoDate(container.openedAt),
                expiresAt: isoDate(container.expiresAt),
                notes: container.notes,
              }}
              units={units}
              people={scope === "all" ? activeUserOptions() : []}
              mixtures={mixtureOptions()}
              canChooseOwner={scope === "all"}
            />
          </Card>
          <div className="space-y-6">
            <Card title="Move">
              <MoveDialog container={{ id: container.id, label: container.label, storageUnitId: container.storageUnitId, roomCode: container.roomCode, unitCode: container.unitCode, contents: { substanceId: container.substanceId, mixtureId: container.mixtureId, amount: container.amount, amountUnit: container.amountUnit } }} units={units} initialTarget={idParam(moveTo ?? "") ?? undefined} />
            </Card>
            <Card title="State">
              <ContainerStateButtons id={container.id} current={container.state} />
            </Card>
          </div>
        </div>
      ) : null}

      <Card title="History">
        <AuditTrail events={auditTrail("container", container.id)} />
      </Card>
    </div>
  );
}
