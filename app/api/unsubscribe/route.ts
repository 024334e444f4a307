// POST /api/unsubscribe: stop one kind of mail for one sponsor and student (RFC 8058 one-click, or the confirmation form)
import { NextResponse, type NextRequest } from "next/server";
import { applyUnsubscribe } from "@/db/access/mail/unsubscribe";
import { apiError, errorResponse } from "@/lib/http/api";

// Public by design: the signed token (HMAC, bound to sponsor, student and kind) is the credential.
// A mail client's one-click POST carries the token in the URL and "List-Unsubscribe=One-Click" in
// the body; the confirmation page's form posts the token as a field and is sent back to the page.
export async function POST(req: NextRequest): Promise<Response> {
  try {
    const url = new URL(req.url);
    let token = url.searchParams.get("token") ?? "";
    let fromForm = false;
    const type = req.headers.get("content-type") ?? "";
    if (type.includes("application/x-www-form-urlencoded") || type.includes("multipart/form-data")) {
      const form = await req.formData().catch(() => null);
      const field = form?.get("token");
      if (typeof field === "string" && field) {
        token = field;
        fromForm = true;
      }
    }
    if (!token) return apiError(400, "token: missing", "token");
    const ok = await applyUnsubscribe(token);
    if (!ok) return apiError(400, "token: not a valid unsubscribe link", "token");
    // a relative Location keeps the browser on the origin it used (the page's CSP allows form-action 'self' only)
    if (fromForm) return new Response(null, { status: 303, headers: { Location: `/unsubscribe/${encodeURIComponent(token)}?done=1` } });
    return NextResponse.json({ unsubscribed: true });
  } catch (e) {
    return errorResponse(e);
  }
}
