// GET /api/today: the caller's own Today list (cohorts, students, stage items or sponsored students).
import { NextResponse } from "next/server";
import { route } from "@/lib/http/api";
import { todayFocusList } from "@/db/access/today/focus-list";

export const dynamic = "force-dynamic";

export const GET = route("today.view", async ({ user }) => NextResponse.json(await todayFocusList(user)));
