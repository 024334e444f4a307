"use client";
import { useRef, useState } from "react";
import { useRouter } from "next/navigation";
import { apiErrorText } from "@/lib/validation/messages";

const MAX = 10 * 1024 * 1024;
const TYPES: Record<string, string> = { pdf: "application/pdf", png: "image/png", jpg: "image/jpeg", jpeg: "image/jpeg" };

/** Sends the file as the raw request body, so the route handler can count its bytes as they arrive. */
export function HandoutUpload({ briefingId }: { briefingId: string }) {
  const router = useRouter();
  const input = useRef<HTMLInputElement>(null);
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const [busy, setBusy] = useState(false);

  async function upload(e: React.FormEvent) {
    e.preventDefault();
    const file = input.current?.files?.[0];
    if (!file) return setMessage({ ok: false, text: "Choose a file first." });
    if (file.size > MAX) return setMessage({ ok: false, text: "That file is larger than 10 MB." });
    const ext = file.name.split(".").pop()?.toLowerCase() ?? "";
    setBusy(true);
    setMessage(null);
    try {
      const res = await fetch(`/api/briefings/${briefingId}/handouts?name=${encodeURIComponent(file.name)}`, {
        method: "POST",
        headers: { "content-type": file.type || TYPES[ext] || "application/octet-stream" },
        body: file,
      });
      if (res.ok) {
        const data = (await res.json()) as { revisionNumber: number };
        setMessage({ ok: true, text: `Added. The briefing is now at revision ${data.revisionNumber}.` });
        if (input.current) input.current.value = "";
        router.refresh();
      } else {
        const data = (await res.json().catch(() => null)) as { error?: { message?: string } } | null;
        setMessage({ ok: false, text: apiErrorText(data?.error, `Upload refused (${res.status}).`) });
      }
    } finally {
      setBusy(false);
    }
  }

  return (
    <form onSubmit={upload} className="flex flex-wrap items-end gap-3" aria-label="Add a handout">
      <div>
        <label htmlFor="handout-file" className="field-label">
          Add a handout (PDF, PNG or JPEG, up to 10 MB)
        </label>
        <input
          id="handout-file"
          ref={input}
          type="file"
          accept=".pdf,.png,.jpg,.jpeg,application/pdf,image/png,image/jpeg"
          className="field-input py-2"
        />
      </div>
      <button type="submit" className="btn-quiet" disabled={busy}>
        {busy ? "Uploading…" : "Upload"}
      </button>
      <p
        aria-live="polite"
        role="status"
        className={message?.ok ? "text-caption text-solid-800" : "field-error"}
        data-testid="upload-status"
      >
        {message?.text}
      </p>
    </form>
  );
}
