import type { Metadata } from "next";
import { requirePagePermission } from "@/lib/auth/guard";
import { authoritySettingsFor } from "@/db/access/endorsements/settings";
import { AuthoritySettingsForm } from "./settings-form";

export const metadata: Metadata = { title: "Endorsement settings" };
export const dynamic = "force-dynamic";

export default async function EndorsementSettingsPage() {
  const user = await requirePagePermission("endorsements.settings", "/endorsements/settings");
  const { saved, ...settings } = await authoritySettingsFor(user.schoolId);
  return (
    <div className="max-w-3xl space-y-6">
      <div>
        <h1 className="text-display">Endorsement settings</h1>
        <p className="text-ink-soft">
          The authority the school trains for and its knowledge-test rules. {saved ? "" : "Nothing saved yet: these are the defaults."} The
          wording may use {"{student}"} and {"{course}"}; each endorsement keeps the wording it was signed with.
        </p>
      </div>
      <AuthoritySettingsForm settings={settings} />
    </div>
  );
}
