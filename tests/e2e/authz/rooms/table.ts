// The Rooms list's rows of the authorisation table: only the chief (rooms.manage) changes the list.
// The chief's calls keep the seeded rooms' names and leave them in use, so other tests still find them.
import type { AuthzTable, HarnessResponse } from "../types";

const result = (res: HarnessResponse) => res.json as { ok: boolean; data?: Record<string, unknown> };

export const ROOMS_TABLE: AuthzTable = {
  "action app/(app)/rooms/actions.ts#createRoomAction": {
    request: (_fx, caller) => ({ args: [{ name: `Harness room ${caller}`, capacity: "8", idempotencyKey: `harness-room-${caller}` }] }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res) => expect(result(res).data).toMatchObject({ name: "Harness room chief" }) },
      instructor: 403,
      student: 403,
      sponsor: 403,
    },
    mutates: true,
  },
  "action app/(app)/rooms/actions.ts#updateRoomAction": {
    request: (fx) => ({ args: [{ roomId: fx.hangarRoom, name: "Hangar classroom", capacity: "24" }] }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res, fx) => expect(result(res).data).toEqual({ id: fx.hangarRoom, name: "Hangar classroom" }) },
      instructor: 403,
      student: 403,
      sponsor: 403,
    },
    mutates: true,
    secrets: (fx) => [fx.hangarRoom!],
  },
  "action app/(app)/rooms/actions.ts#setRoomActiveAction": {
    request: (fx) => ({ args: [{ roomId: fx.hangarRoom, active: true }] }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res, fx) => expect(result(res).data).toEqual({ id: fx.hangarRoom, active: true }) },
      instructor: 403,
      student: 403,
      sponsor: 403,
    },
    mutates: true,
    secrets: (fx) => [fx.hangarRoom!],
  },
};
