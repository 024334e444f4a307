// POST /api/transfers/credits: record a transfer credit (multipart form: fields and the evidence file, up to 10 MB).
import { NextResponse } from "next/server";
import { route } from "@/lib/http/api";
import { saveTransferCredit } from "@/db/access/transfers/record-credit";
import { readTransferForm } from "./_lib/form";

export const dynamic = "force-dynamic";

export const POST = route("transfers.manage", async ({ req, user }) => {
  const { input, file } = await readTransferForm(req);
  const saved = await saveTransferCredit(user, input, file);
  return NextResponse.json(saved, { status: saved.replayed ? 200 : 201 });
});
