/**
 * What the scale bench loads: every signed-in page and API that lists or summarises, for each
 * role that may open it (each role's Today, Records, the Sign-off register and its CSV, the
 * Progress map, the Timetable and its list API, the Ground log). `{student}` is the demo
 * student's id (the student's own map; the one staff and the sponsor open).
 */
export type Role = "chief" | "instructor" | "student" | "sponsor";

export interface Endpoint {
  role: Role;
  label: string;
  path: string;
  /**
   * An export of every matching row: its answer grows with the data by design (it streams), so its
   * growth is judged per megabyte exported (the cost of a row must not grow), not per request.
   */
  export?: true;
}

export const ENDPOINTS: Endpoint[] = [
  { role: "chief", label: "Today", path: "/today" },
  { role: "chief", label: "Today API", path: "/api/today" },
  { role: "chief", label: "Records", path: "/records" },
  { role: "chief", label: "Sign-off register", path: "/register" },
  { role: "chief", label: "Sign-off register CSV", path: "/api/register/export", export: true },
  { role: "chief", label: "Progress map list", path: "/progress" },
  { role: "chief", label: "Progress map", path: "/progress/{student}" },
  { role: "chief", label: "Progress map API", path: "/api/progress/{student}" },
  { role: "chief", label: "Timetable", path: "/timetable" },
  { role: "chief", label: "Sessions API", path: "/api/sessions" },
  { role: "chief", label: "Ground log", path: "/ground-log" },
  { role: "instructor", label: "Today", path: "/today" },
  { role: "instructor", label: "Today API", path: "/api/today" },
  { role: "instructor", label: "Records", path: "/records" },
  { role: "instructor", label: "Progress map list", path: "/progress" },
  { role: "instructor", label: "Timetable", path: "/timetable" },
  { role: "instructor", label: "Sessions API", path: "/api/sessions" },
  { role: "instructor", label: "Ground log", path: "/ground-log" },
  { role: "student", label: "Today", path: "/today" },
  { role: "student", label: "Today API", path: "/api/today" },
  { role: "student", label: "Progress map", path: "/progress/{student}" },
  { role: "student", label: "Timetable", path: "/timetable" },
  { role: "student", label: "Sessions API", path: "/api/sessions" },
  { role: "student", label: "Ground log", path: "/ground-log" },
  { role: "sponsor", label: "Today", path: "/today" },
  { role: "sponsor", label: "Today API", path: "/api/today" },
  { role: "sponsor", label: "Progress map", path: "/progress/{student}" },
  { role: "sponsor", label: "Ground log", path: "/ground-log" },
];
