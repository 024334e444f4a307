// Practice questions (issue 14, the student): only a student answers, on their own assigned demos.
import type { AuthzTable } from "../types";

const STUDENT_ONLY = { signedOut: 401, chief: 403, instructor: 403, sponsor: 403 } as const;

export const PRACTICE_TABLE: AuthzTable = {
  "action app/(app)/practice/actions.ts#answerPracticeAction": {
    // a glide from 3,000 ft on the seeded bucket demo (assigned to the demo student): scored at once
    request: (fx) => ({
      args: [{ demoRevisionId: fx.curveLabBucketRevision, itemId: null, kind: "glide_distance", inputs: { heightFt: 3000 }, figure: 1 }],
    }),
    expect: {
      ...STUDENT_ONLY,
      student: {
        status: 200,
        check: (res) => expect(res.json).toMatchObject({ ok: true, data: { correct: false, worked: expect.stringContaining("NM") } }),
      },
    },
    mutates: true,
  },
  "action app/(app)/practice/actions.ts#submitPracticeTestAction": {
    request: (fx) => ({
      args: [
        {
          answers: [
            { demoRevisionId: fx.curveLabBucketRevision, itemId: null, kind: "glide_distance", inputs: { heightFt: 3000 }, figure: 1 },
          ],
        },
      ],
    }),
    expect: {
      ...STUDENT_ONLY,
      student: {
        status: 200,
        check: (res) => expect(res.json).toMatchObject({ ok: true, data: { result: { correct: 0, total: 1, passed: false } } }),
      },
    },
    mutates: true,
  },
};
