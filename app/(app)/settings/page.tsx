import type { Metadata } from "next";
import { requirePagePermission } from "@/lib/auth/guard";
import { getSchool } from "@/db/access/shared/school";
import { SettingsForm } from "./_components/settings-form";

export const metadata: Metadata = { title: "School settings" };
export const dynamic = "force-dynamic";

export default async function SettingsPage() {
  const user = await requirePagePermission("settings.edit", "/settings");
  const school = await getSchool(user.schoolId);
  const s = school.settings;
  return (
    <div className="max-w-2xl space-y-6">
      <div>
        <h1 className="text-display">School settings</h1>
        <p className="text-ink-soft">
          {school.name} · times are read in {school.timeZone}
        </p>
      </div>
      <SettingsForm
        initial={{
          mailSenderName: s.mailSenderName ?? "",
          reminderLeadHours: s.reminderLeadHours,
          weeklyLetterDay: s.weeklyLetterDay,
          checkValidityDays: s.checkValidityDays,
          stageCheckPassMarkPercent: s.stageCheckPassMarkPercent,
          lateEntryDays: s.lateEntryDays,
          authority: s.authority ?? "",
        }}
        schoolName={school.name}
      />
    </div>
  );
}
