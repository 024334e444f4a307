import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { can, requirePagePermission, HttpError } from "@/lib/auth/guard";
import { formatDay } from "@/lib/time";
import { studentSharing } from "@/db/access/sharing/sponsors-of-student";
import { SharingView } from "../_components/sharing-view";
import { BirthDateForm } from "../_components/birth-date-form";

export const metadata: Metadata = { title: "Sponsors of a student" };
export const dynamic = "force-dynamic";

export default async function StudentSharingPage({ params }: { params: Promise<{ studentId: string }> }) {
  const { studentId } = await params;
  const user = await requirePagePermission("sharing.students", `/sharing/${studentId}`);
  const sharing = await studentSharing(user, studentId).catch((e: unknown) => {
    if (e instanceof HttpError && e.status === 404) notFound();
    throw e;
  });
  return (
    <div className="max-w-2xl space-y-4">
      <h1 className="text-display">Sponsors of {sharing.student.name}</h1>
      <section className="card space-y-2" aria-labelledby="birth-title">
        <h2 id="birth-title">Date of birth</h2>
        {can(user, "sharing.birthdate") ? (
          <BirthDateForm studentId={sharing.student.id} studentName={sharing.student.name} birthDate={sharing.birthDate} />
        ) : (
          <p data-testid="birth-date">
            {sharing.birthDate ? `Born ${formatDay(sharing.birthDate)}.` : "Not on file."} The chief instructor records it.
          </p>
        )}
      </section>
      <SharingView sharing={sharing} as="staff" />
    </div>
  );
}
