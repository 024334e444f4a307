import type { Metadata } from "next";
import { z } from "zod";
import Link from "next/link";
import { can, requirePagePermission } from "@/lib/auth/guard";
import { rolesAllow } from "@/lib/auth/permissions";
import { peopleChoices } from "@/db/access/directory/people";
import { studentChoices } from "@/db/access/directory/students";
import { peoplePage } from "@/db/access/people/people-page";
import { cohortRosters, ROSTERS_SHOWN } from "@/db/access/people/cohort-rosters";
import { ListPageNav } from "@/components/student-pages";
import { ROLES, ROLE_LABELS } from "@/lib/auth/roles";
import { WideTable } from "@/components/ui/wide-table";
import { formatDay } from "@/lib/time";
import { AccountControls } from "./_components/account-controls";

export const metadata: Metadata = { title: "People" };
export const dynamic = "force-dynamic";

const blank = (v: unknown) => (v === "" ? undefined : v);
const query = z.object({
  role: z.preprocess(blank, z.enum(ROLES).optional()),
  q: z.preprocess(blank, z.string().trim().max(100).optional()),
  page: z.preprocess(blank, z.coerce.number().int().min(1).max(100_000).optional()),
});

export default async function PeoplePage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requirePagePermission("people.view", "/people");
  const parsed = query.safeParse(await searchParams);
  const filter = parsed.success ? parsed.data : {};
  const everyone = can(user, "people.all");
  // the first cohorts' rosters (one query for their members) and one page of everyone: bounded whatever the school's size
  const { rosters, total: cohortsTotal } = await cohortRosters(user.schoolId, everyone ? {} : { leadInstructorId: user.id }, ROSTERS_SHOWN);
  const everyonePage = everyone
    ? await peoplePage(user.schoolId, { role: filter.role, q: filter.q }, { page: filter.page ?? 1 })
    : { rows: [], total: 0, page: 1, pageSize: 1 };
  const people = everyonePage.rows;
  const everyonePairs: [string, string][] = [
    ...(filter.q ? ([["q", filter.q]] as [string, string][]) : []),
    ...(filter.role ? ([["role", filter.role]] as [string, string][]) : []),
  ];
  const manage = can(user, "people.manage");
  // the account pickers list while few, else search (db/access/directory, GET /api/directory/*)
  const accounts = manage
    ? await Promise.all([peopleChoices(user, "any"), peopleChoices(user, "sponsor"), studentChoices(user, "sponsors")])
    : null;
  return (
    <div className="space-y-6">
      <h1 className="text-display">People</h1>
      {manage && (
        <p>
          <Link className="underline" href="/people/accounts">
            Invite people and change roles
          </Link>
        </p>
      )}
      {!parsed.success && (
        <p role="alert" className="field-error">
          Filter ignored: {parsed.error.issues[0]?.path.join(".")} is not valid.
        </p>
      )}
      {rosters.map(({ cohort, members }) => (
        <section key={cohort.id} className="card" aria-labelledby={`c-${cohort.id}`}>
          <h2 id={`c-${cohort.id}`}>
            {cohort.name}{" "}
            <span className="text-caption font-normal text-ink-soft">
              · lead {cohort.leadInstructorName} · from {formatDay(cohort.startsOn)}
            </span>
          </h2>
          <div className="mt-2">
            <WideTable label={`${cohort.name} roster, scrolls sideways`} more={2}>
              <table className="data-table">
                <thead>
                  <tr>
                    <th scope="col">Student</th>
                    <th scope="col" data-more="">
                      E-mail
                    </th>
                    <th scope="col">Member from</th>
                    <th scope="col" data-more="">
                      to
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {members.map((m) => (
                    <tr key={`${m.studentId}-${m.fromDate}`}>
                      <td>{m.name}</td>
                      <td className="break-all" data-more="">
                        {m.email}
                      </td>
                      <td className="num">{formatDay(m.fromDate)}</td>
                      <td className="num" data-more="">
                        {m.toDate ? formatDay(m.toDate) : "—"}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </WideTable>
          </div>
        </section>
      ))}
      {cohortsTotal > rosters.length && (
        <p className="text-caption text-ink-soft" data-testid="rosters-count">
          The rosters of the first <span className="num">{rosters.length}</span> of{" "}
          <span className="num">{cohortsTotal.toLocaleString("en-GB")}</span> cohorts, by start date.
          {can(user, "roster.manage") && (
            <>
              {" "}
              <Link href="/roster" className="inline-block min-h-touch py-2 underline">
                Every cohort on the Roster page
              </Link>
            </>
          )}
        </p>
      )}
      {everyone && (
        <section className="card" aria-labelledby="everyone">
          <h2 id="everyone">Everyone at the school</h2>
          <form className="mt-2 flex flex-wrap items-end gap-3" method="get">
            <div>
              <label htmlFor="q" className="field-label">
                Name or e-mail
              </label>
              <input id="q" name="q" defaultValue={filter.q ?? ""} className="field-input" />
            </div>
            <div>
              <label htmlFor="role" className="field-label">
                Role
              </label>
              <select id="role" name="role" defaultValue={filter.role ?? ""} className="field-input">
                <option value="">Any role</option>
                {ROLES.map((r) => (
                  <option key={r} value={r}>
                    {ROLE_LABELS[r]}
                  </option>
                ))}
              </select>
            </div>
            <button type="submit" className="btn-quiet">
              Filter
            </button>
          </form>
          <div className="mt-3">
            <WideTable label="Everyone at the school, scrolls sideways" more={2}>
              <table className="data-table">
                <thead>
                  <tr>
                    <th scope="col">Name</th>
                    <th scope="col" data-more="">
                      E-mail
                    </th>
                    <th scope="col">Roles</th>
                    <th scope="col" data-more="">
                      Status
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {people.map((p) => (
                    <tr key={p.id}>
                      <td>{rolesAllow(p.roles, "records.sign") ? <Link href={`/people/${p.id}`}>{p.name}</Link> : p.name}</td>
                      <td className="break-all" data-more="">
                        {p.email}
                      </td>
                      <td>{p.roles.map((r) => ROLE_LABELS[r]).join(", ")}</td>
                      <td data-more="">{p.active ? "Active" : "Deactivated"}</td>
                    </tr>
                  ))}
                  {people.length === 0 && (
                    <tr>
                      <td colSpan={4} className="text-ink-soft">
                        {everyonePage.page > 1 ? `No one on page ${everyonePage.page}.` : "No one matches."}
                      </td>
                    </tr>
                  )}
                </tbody>
              </table>
            </WideTable>
          </div>
          <div className="mt-3">
            <ListPageNav
              basePath="/people"
              pairs={everyonePairs}
              page={everyonePage.page}
              pageSize={everyonePage.pageSize}
              shown={people.length}
              total={everyonePage.total}
              label="Everyone at the school, pages"
              testId="people-pages"
              noun="People"
            />
          </div>
        </section>
      )}
      {accounts && <AccountControls people={accounts[0]} sponsors={accounts[1]} students={accounts[2]} />}
    </div>
  );
}
