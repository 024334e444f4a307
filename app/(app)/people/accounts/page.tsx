import type { Metadata } from "next";
import Link from "next/link";
import { requirePagePermission } from "@/lib/auth/guard";
import { accountsPage } from "@/db/access/people/accounts-page";
import { parseNameListQuery } from "@/lib/records/student-list-query";
import { ListPageNav, NameFilterForm, QueryProblem } from "@/components/student-pages";
import { ROLE_LABELS } from "@/lib/auth/roles";
import { ASSIGNABLE_ROLES } from "@/lib/auth/account-roles";
import { DataTable } from "@/components/ui/data-table";
import { InviteForm } from "./_components/invite-form";
import { RolesForm } from "./_components/roles-form";

export const metadata: Metadata = { title: "Accounts and roles" };
export const dynamic = "force-dynamic";

export default async function AccountsPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requirePagePermission("people.manage", "/people/accounts");
  const { q, problem } = parseNameListQuery(await searchParams);
  // one page of staff and sponsors (every account but students'), narrowed by a part of the name
  const { rows: staffAndSponsors, total, page, pageSize } = await accountsPage(user.schoolId, { name: q.name }, { page: q.page ?? 1 });
  const roles = ASSIGNABLE_ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }));
  return (
    <div className="max-w-4xl space-y-6">
      <header>
        <p className="text-caption">
          <Link className="underline" href="/people">
            People
          </Link>{" "}
          / Accounts and roles
        </p>
        <h1 className="text-display">Accounts and roles</h1>
        <p className="text-ink-soft">
          Invite instructors, chief instructors and sponsors; students join through the{" "}
          <Link className="underline" href="/roster">
            Roster
          </Link>
          . A change of roles ends the person&apos;s sessions at once.
        </p>
      </header>
      <InviteForm roles={roles} />
      <NameFilterForm basePath="/people/accounts" name={q.name} idPrefix="accounts" label="Find an account" />
      <QueryProblem problem={problem} instead="every account" />
      <RolesForm roles={roles} people={staffAndSponsors.map((p) => ({ id: p.id, name: p.name, roles: p.roles, self: p.id === user.id }))} />
      <section className="card" aria-labelledby="staff-title">
        <h2 id="staff-title">Staff and sponsors</h2>
        <div className="mt-2">
          <DataTable
            label="Staff and sponsors, scrolls sideways"
            testId="accounts-table"
            columns={[{ header: "Name" }, { header: "Roles" }, { header: "E-mail", more: true }]}
          >
            {staffAndSponsors.map((p) => (
              <tr key={p.id}>
                <td>
                  {p.name}
                  {!p.active && <span className="text-caption text-ink-soft"> (deactivated)</span>}
                </td>
                <td>{p.roles.map((r) => ROLE_LABELS[r]).join(", ")}</td>
                <td className="break-all" data-more="">
                  {p.email}
                </td>
              </tr>
            ))}
          </DataTable>
          {staffAndSponsors.length === 0 && (
            <p className="text-ink-soft">
              {page > 1 ? `No accounts on page ${page}.` : q.name ? "No account matches." : "No accounts yet."}
            </p>
          )}
        </div>
        <ListPageNav
          basePath="/people/accounts"
          pairs={q.name ? [["name", q.name]] : []}
          page={page}
          pageSize={pageSize}
          shown={staffAndSponsors.length}
          total={total}
          label="Accounts pages"
          testId="accounts-pages"
          noun="Accounts"
        />
      </section>
    </div>
  );
}
