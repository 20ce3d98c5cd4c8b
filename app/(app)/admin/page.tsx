import type { Metadata } from "next";
import { priorityCellClass, SecondaryValues, TABLE_CONTAINER_CLASS } from "@/components/data-table/priority";
import { Card, PageHeader } from "@/components/ui/card";
import { listUsers } from "@/db/queries/users";
import { requirePagePermission } from "@/lib/auth/page";
import { countLiveSessionsByUser } from "@/lib/auth/session-store";
import { ROLE_LABELS } from "@/lib/auth/permissions";
import { formatDateTime } from "@/lib/format/numbers";
import { ssoConfigured } from "@/lib/sso/client";
import { AdminTabs } from "./admin-tabs";
import { InviteForm } from "./invite-form";
import { UserRowActions } from "./user-row-actions";

export const metadata: Metadata = { title: "Admin" };

function StatusText({ active, activated }: { active: boolean; activated: boolean }) {
  if (!active) return <span className="text-sev-critical">● Deactivated</span>;
  if (!activated) return <span className="text-sev-moderate">◌ Invited</span>;
  return <span className="text-ok">● Active</span>;
}

function sessionText(count: number): string {
  return count === 0 ? "not signed in" : `signed in: ${count} session${count === 1 ? "" : "s"}`;
}

export default async function AdminPage() {
  const { user } = await requirePagePermission("users.manage");
  const people = listUsers();
  const sessionCounts = countLiveSessionsByUser();
  const pending = people.filter((p) => p.active && !p.hasPassword && !p.ssoLinked).length;
  const sso = ssoConfigured();
  return (
    <div>
      <PageHeader
        title="Administration"
        description={`${people.length} accounts${pending ? `, ${pending} invitation${pending === 1 ? "" : "s"} not yet accepted` : ""}. Roles decide what each person may see and change; the server checks them on every request.`}
      />
      <AdminTabs current="users" />
      <div className="grid grid-cols-[minmax(0,1fr)] gap-6 xl:grid-cols-[minmax(0,1fr)_340px]">
        <Card title={`People (${people.length})`}>
          <div className={`${TABLE_CONTAINER_CLASS} -mx-4 -my-4 overflow-x-auto`}>
            <table className="w-full text-sm">
              <thead className="sticky top-0 bg-ink-50">
                <tr className="border-b border-ink-200 text-left text-xs uppercase tracking-wide text-ink-600">
                  <th scope="col" className="px-4 py-2 font-medium">Name</th>
                  <th scope="col" className={`px-4 py-2 font-medium ${priorityCellClass(2)}`}>Role</th>
                  <th scope="col" className={`px-4 py-2 font-medium ${priorityCellClass(2)}`}>Status</th>
                  <th scope="col" className={`px-4 py-2 font-medium ${priorityCellClass(3)}`}>Signs in with</th>
                  <th scope="col" className={`px-4 py-2 font-medium ${priorityCellClass(3)}`}>Last sign-in</th>
                  <th scope="col" className="px-4 py-2 font-medium">Change</th>
                </tr>
              </thead>
              <tbody>
                {people.map((person) => {
                  const role = ROLE_LABELS[person.role];
                  const status = <StatusText active={person.active} activated={person.hasPassword || person.ssoLinked} />;
                  const method = person.signInMethod === "sso" ? "Institution (single sign-on)" : "Password";
                  const lastSignIn = (
                    <>
                      {person.lastSignInAt ? formatDateTime(person.lastSignInAt) : "never"}
                      <span className="block">{sessionText(sessionCounts.get(person.id) ?? 0)}</span>
                    </>
                  );
                  return (
                    <tr key={person.id} className="border-b border-ink-100 align-top last:border-0">
                      <th scope="row" className="px-4 py-3 text-left font-normal">
                        <p className="font-medium text-ink-900">{person.name}</p>
                        <p className="text-xs text-ink-600">{person.email}</p>
                        <SecondaryValues
                          items={[
                            { key: "role", label: "Role", value: role, priority: 2 },
                            { key: "method", label: "Signs in with", value: method, priority: 3 },
                            { key: "status", label: "Status", value: status, priority: 2 },
                            {
                            key: "signIn",
                            label: "Last sign-in",
                            value: `${person.lastSignInAt ? formatDateTime(person.lastSignInAt) : "never"} · ${sessionText(sessionCounts.get(person.id) ?? 0)}`,
                            priority: 3,
                          },
                          ]}
                        />
                      </th>
                      <td className={`px-4 py-3 text-ink-800 ${priorityCellClass(2)}`}>{role}</td>
                      <td className={`whitespace-nowrap px-4 py-3 text-xs font-medium ${priorityCellClass(2)}`}>{status}</td>
                      <td className={`px-4 py-3 text-xs text-ink-700 ${priorityCellClass(3)}`}>{method}</td>
                      <td className={`tabular whitespace-nowrap px-4 py-3 text-xs text-ink-600 ${priorityCellClass(3)}`}>{lastSignIn}</td>
                      <td className="px-4 py-3">
                        <UserRowActions userId={person.id} name={person.name} role={person.role} active={person.active} isSelf={person.id === user.id} sessionCount={sessionCounts.get(person.id) ?? 0} />
                      </td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
        </Card>
        <Card title="Invite a person">
          <p className="mb-4 text-sm text-ink-600">
            They receive a link by e-mail, valid for seven days, to choose a password
            {sso ? "; or, invited for their institution's sign-in, an e-mail telling them to use “Sign in with your institution”" : ""}.
          </p>
          <InviteForm sso={sso} />
        </Card>
      </div>
    </div>
  );
}
