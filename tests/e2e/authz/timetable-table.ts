// The Timetable's, rosters', attendance's and Ground log's rows of the authorisation table.
// Each mutating cell has its own target (see timetable-fixtures.ts), so callers do not interfere.
import type { AuthzTable, HarnessResponse } from "./types";

const ok = (res: HarnessResponse) => res.json as { ok: boolean; data?: Record<string, unknown> };
const sessionsOf = (res: HarnessResponse) => (res.json as { rows: { id: string; cohortName: string | null }[]; total: number }).rows;

// the demo accounts' password: amending attendance and waiving a make-up item are signed with it
const PASSWORD = "chalkwing-demo";
const csv = (email: string) => `name,email,cohort\nHarness Preview,${email},Kestrel cohort\n`;

export const TIMETABLE_TABLE: AuthzTable = {
  "GET /api/sessions": {
    request: () => ({ query: "status=all&pageSize=100&sort=starts_at&dir=asc" }),
    expect: {
      signedOut: 401,
      chief: {
        status: 200,
        check: (res, fx) =>
          expect(sessionsOf(res).map((r) => r.id)).toEqual(expect.arrayContaining([fx.kestrelSessionSoon, fx.merlinSessionToMove])),
      },
      instructor: { status: 200, check: (res, fx) => expect(sessionsOf(res).map((r) => r.id)).toContain(fx.merlinSessionToMove) },
      student: {
        status: 200,
        check: (res, fx) => {
          // only the sessions the student attends: Kestrel's, never Merlin's
          const rows = sessionsOf(res);
          expect(rows.map((r) => r.id)).toContain(fx.kestrelSessionSoon);
          expect(rows.every((r) => r.cohortName === "Kestrel cohort")).toBe(true);
          expect(res.text).not.toContain(fx.merlinSessionToMove);
        },
      },
      sponsor: 403,
    },
    secrets: (fx) => [fx.kestrelSessionSoon!, fx.merlinSessionToMove!],
  },

  "GET /api/calendar/[token]": {
    request: (fx) => ({ params: { token: `${fx.calendarToken}.ics` } }),
    expect: {
      // the token is the credential: anyone holding it gets the feed, with or without a session
      signedOut: {
        status: 200,
        check: (res, fx) => {
          expect(res.text).toContain("BEGIN:VCALENDAR");
          expect(res.text).toContain(`UID:${fx.kestrelSessionSoon}@sessions.chalkwing.test`);
        },
      },
      chief: 200,
      instructor: 200,
      student: { status: 200, check: (res, fx) => expect(res.text).not.toContain(fx.merlinSessionToMove) },
      sponsor: 200,
    },
  },

  "POST /api/roster/import": {
    request: (_fx, caller) => ({
      query: "mode=preview",
      rawBody: csv(`harness.preview.${caller}@chalkwing.test`),
      contentType: "text/csv",
    }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res) => expect((res.json as { rows: { problems: string[] }[] }).rows[0]!.problems).toEqual([]) },
      instructor: { status: 200, check: (res) => expect((res.json as { readyCount: number }).readyCount).toBe(1) },
      student: 403,
      sponsor: 403,
    },
  },

  "GET /api/ground-log/[studentId]/logbook": {
    // a student asks for a Merlin student's logbook: not theirs, so 404
    request: (fx, caller) => ({ params: { studentId: caller === "student" ? fx.otherStudent : fx.student } }),
    expect: {
      signedOut: 401,
      chief: {
        status: 200,
        check: (res) =>
          expect(res.text.split("\r\n")[0]).toContain("Date,Minutes credited,Hours,Attendance,Subjects,Instructor,Instructor certificate"),
      },
      instructor: { status: 200, check: (res) => expect(res.text).toContain("LHV-GI-0142") },
      student: 404,
      sponsor: { status: 200, check: (res) => expect(res.headers.get("content-disposition")).toContain("logbook-ada-quill.csv") },
    },
    secrets: (fx) => [fx.otherStudent, "Lotte Lindqvist"],
  },

  "action app/(app)/timetable/actions.ts#scheduleSessionAction": {
    request: (fx, caller) => ({
      args: [
        {
          briefingId: fx.briefing,
          date: caller === "chief" ? "2027-07-01" : "2027-07-02",
          time: "10:00",
          durationMinutes: 60,
          room: "Hangar classroom",
          instructorId: fx.instructor,
          cohortId: fx.kestrelCohort,
          studentIds: [],
        },
      ],
    }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res) => expect(ok(res).data?.attendeeCount).toBeGreaterThan(0) },
      instructor: 200,
      student: 403,
      sponsor: 403,
    },
    mutates: true,
  },

  "action app/(app)/timetable/actions.ts#rescheduleSessionAction": {
    request: (fx, caller) => ({
      params: { sessionId: caller === "chief" ? fx.merlinSessionToMove! : fx.kestrelSessionToMove! },
      args: [
        caller === "chief"
          ? {
              sessionId: fx.merlinSessionToMove,
              date: "2027-06-01",
              time: "10:00",
              durationMinutes: 90,
              room: "Briefing room 2",
              instructorId: fx.otherInstructor,
            }
          : {
              sessionId: fx.kestrelSessionToMove,
              date: "2027-06-02",
              time: "10:00",
              durationMinutes: 90,
              room: "Hangar classroom",
              instructorId: fx.instructor,
            },
      ],
    }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res) => expect(ok(res).data?.sequence).toBe(1) },
      instructor: { status: 200, check: (res) => expect(ok(res).data?.told).toBeGreaterThan(0) },
      student: 403,
      sponsor: 403,
    },
    mutates: true,
  },

  "action app/(app)/timetable/actions.ts#cancelSessionAction": {
    request: (fx, caller) => {
      const sessionId = caller === "chief" ? fx.merlinSessionToCancel! : fx.kestrelSessionToCancel!;
      return { params: { sessionId }, args: [{ sessionId, reason: "Harness cancellation" }] };
    },
    expect: { signedOut: 401, chief: 200, instructor: 200, student: 403, sponsor: 403 },
    mutates: true,
  },

  "action app/(app)/timetable/actions.ts#recordAttendanceAction": {
    request: (fx, caller) => ({
      params: { sessionId: caller === "chief" ? fx.merlinSessionAwaiting! : fx.kestrelSessionAwaiting! },
      args: [
        caller === "chief"
          ? { sessionId: fx.merlinSessionAwaiting, lines: [{ studentId: fx.otherStudent, status: "late", lateMinutes: 10 }] }
          : { sessionId: fx.kestrelSessionAwaiting, lines: [{ studentId: fx.cohortmate, status: "attended" }] },
      ],
    }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res) => expect(ok(res).data?.recorded).toBe(1) },
      instructor: 200,
      student: 403,
      sponsor: 403,
    },
    mutates: true,
  },

  "action app/(app)/timetable/actions.ts#amendEntryAction": {
    // posted from a session's page; which page does not matter to the action
    request: (fx, caller) => ({
      params: { sessionId: fx.kestrelSessionRecorded! },
      args: [
        {
          entryId: caller === "chief" ? fx.otherStudentEntry : fx.studentEntry,
          status: "attended",
          reason: "Harness correction",
          password: PASSWORD,
        },
      ],
    }),
    expect: { signedOut: 401, chief: 200, instructor: 200, student: 403, sponsor: 403 },
    mutates: true,
  },

  "action app/(app)/timetable/actions.ts#resetCalendarTokenAction": {
    request: () => ({ args: [{}] }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res) => expect(String(ok(res).data?.path)).toMatch(/^\/api\/calendar\/[A-Za-z0-9_-]{43}\.ics$/) },
      instructor: 200,
      student: 200,
      sponsor: 403,
    },
    mutates: true,
  },

  "action app/(app)/ground-log/actions.ts#scheduleMakeupAction": {
    request: (fx, caller) => ({ args: [{ itemId: caller === "chief" ? fx.makeupA : fx.makeupB, sessionId: fx.kestrelSessionSoon }] }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res) => expect(ok(res).data?.state).toBe("scheduled") },
      instructor: 200,
      student: 403,
      sponsor: 403,
    },
    mutates: true,
  },

  "action app/(app)/ground-log/actions.ts#closeMakeupAction": {
    request: (fx, caller) => ({ args: [{ itemId: caller === "chief" ? fx.makeupC : fx.makeupD, how: "one_to_one", note: "Harness" }] }),
    expect: { signedOut: 401, chief: 200, instructor: 200, student: 403, sponsor: 403 },
    mutates: true,
  },

  "action app/(app)/ground-log/actions.ts#waiveMakeupAction": {
    request: (fx) => ({ args: [{ itemId: fx.makeupE, reason: "Harness waiver", password: PASSWORD }] }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res) => expect(ok(res).data?.state).toBe("waived") },
      instructor: 403,
      student: 403,
      sponsor: 403,
    },
    mutates: true,
  },

  "action app/(app)/roster/actions.ts#addStudentAction": {
    request: (fx, caller) => ({
      args: [{ name: `Harness Added ${caller}`, email: `harness.added.${caller}@chalkwing.test`, cohortId: fx.kestrelCohort }],
    }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res) => expect(ok(res).data?.invitations).toBe(1) },
      instructor: 200,
      student: 403,
      sponsor: 403,
    },
    mutates: true,
  },

  "action app/(app)/roster/actions.ts#moveStudentAction": {
    request: (fx, caller) => ({
      args: [
        caller === "chief"
          ? { studentId: fx.merlinMover, toCohortId: fx.kestrelCohort, onDate: "2027-01-15" }
          : { studentId: fx.kestrelMover, toCohortId: fx.merlinCohort, onDate: "2027-01-15" },
      ],
    }),
    expect: { signedOut: 401, chief: 200, instructor: 200, student: 403, sponsor: 403 },
    mutates: true,
  },
};
