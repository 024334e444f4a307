import type { Metadata } from "next";
import { requirePagePermission } from "@/lib/auth/guard";
import { studentSharing } from "@/db/access/sharing/sponsors-of-student";
import { SharingView } from "./_components/sharing-view";

export const metadata: Metadata = { title: "Sharing" };
export const dynamic = "force-dynamic";

export default async function SharingPage() {
  const user = await requirePagePermission("sharing.manage", "/sharing");
  const sharing = await studentSharing(user, user.id);
  return (
    <div className="max-w-2xl space-y-4">
      <div>
        <h1 className="text-display">Sharing</h1>
        <p className="text-ink-soft">
          Your sponsors see only what you tick here, on their Chalkwing pages and in the Weekly letter. A change counts at once. Seeing and
          receiving the letter are separate choices.
        </p>
      </div>
      <SharingView sharing={sharing} as="student" />
    </div>
  );
}
