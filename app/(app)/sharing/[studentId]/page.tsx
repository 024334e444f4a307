import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { requirePagePermission, HttpError } from "@/lib/auth/guard";
import { studentSharing } from "@/db/access/sharing/sponsors-of-student";
import { SharingView } from "../_components/sharing-view";

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
      <SharingView sharing={sharing} as="staff" />
    </div>
  );
}
