export const ROLES = ["chief", "instructor", "student", "sponsor"] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  chief: "Chief instructor",
  instructor: "Instructor",
  student: "Student",
  sponsor: "Sponsor",
};
