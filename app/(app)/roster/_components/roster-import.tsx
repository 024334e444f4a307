"use client";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { ScrollArea } from "@/components/ui/scroll-area";
import { apiErrorText } from "@/lib/validation/messages";

interface PreviewRow {
  line: number;
  name: string;
  email: string;
  cohort: string;
  sponsorName: string;
  sponsorEmail: string;
  problems: string[];
}
interface Preview {
  delimiter: string;
  rows: PreviewRow[];
  fileProblems: string[];
  readyCount: number;
}

const MAX_BYTES = 256 * 1024;

/** Upload a roster CSV: the preview shows every row and its problems; the import writes all rows or none. */
export function RosterImport() {
  const router = useRouter();
  const [text, setText] = useState<string | null>(null);
  const [preview, setPreview] = useState<Preview | null>(null);
  const [msg, setMsg] = useState<{ ok: boolean; text: string } | null>(null);
  const [busy, setBusy] = useState(false);

  async function send(mode: "preview" | "commit", body: string) {
    const res = await fetch(`/api/roster/import?mode=${mode}`, {
      method: "POST",
      headers: { "content-type": "text/csv; charset=utf-8" },
      body,
    });
    const json = await res.json();
    return { ok: res.ok, json };
  }
  async function onFile(e: React.ChangeEvent<HTMLInputElement>) {
    setMsg(null);
    setPreview(null);
    const f = e.target.files?.[0];
    if (!f) return;
    if (f.size > MAX_BYTES) {
      setMsg({ ok: false, text: `file: larger than ${MAX_BYTES / 1024} KB` });
      return;
    }
    const t = await f.text();
    setText(t);
    setBusy(true);
    const r = await send("preview", t);
    setBusy(false);
    if (r.ok) setPreview(r.json as Preview);
    else setMsg({ ok: false, text: apiErrorText(r.json?.error, "The file could not be read") });
  }
  async function onImport() {
    if (!text) return;
    setBusy(true);
    const r = await send("commit", text);
    setBusy(false);
    if (r.ok) {
      setMsg({ ok: true, text: `Imported ${r.json.created} students; ${r.json.invitations} invitations queued.` });
      setPreview(null);
      setText(null);
      router.refresh();
    } else setMsg({ ok: false, text: `Nothing was imported. ${apiErrorText(r.json?.error, "")}` });
  }
  const blocked =
    !preview || preview.fileProblems.length > 0 || preview.rows.some((r) => r.problems.length > 0) || preview.rows.length === 0;
  return (
    <section className="card space-y-3" aria-labelledby="imp-title">
      <h2 id="imp-title">Import a roster file</h2>
      <p className="text-caption text-ink-soft">
        A CSV file with the columns name, e-mail, cohort, and optionally sponsor name and sponsor e-mail. Commas or semicolons; a header row
        first.
      </p>
      <div>
        <label htmlFor="roster-file" className="field-label">
          CSV file
        </label>
        <input id="roster-file" type="file" accept=".csv,text/csv" className="field-input py-2" onChange={onFile} />
      </div>
      <div aria-live="polite">
        {busy && <p>Working…</p>}
        {msg && (
          <p
            role={msg.ok ? "status" : "alert"}
            className={msg.ok ? "font-semibold text-solid-800" : "field-error"}
            data-testid="import-message"
          >
            {msg.text}
          </p>
        )}
      </div>
      {preview && (
        <>
          {preview.fileProblems.map((p) => (
            <p key={p} role="alert" className="field-error">
              {p}
            </p>
          ))}
          <p>
            {preview.readyCount} of {preview.rows.length} rows ready.{" "}
            {blocked ? "Fix the file and choose it again: nothing is imported while any row has a problem." : ""}
          </p>
          <ScrollArea label="Preview of the file, scrolls sideways">
            <table className="data-table" data-testid="import-preview">
              <thead>
                <tr>
                  <th scope="col">Line</th>
                  <th scope="col">Name</th>
                  <th scope="col">E-mail</th>
                  <th scope="col">Cohort</th>
                  <th scope="col">Sponsor</th>
                  <th scope="col">Problems</th>
                </tr>
              </thead>
              <tbody>
                {preview.rows.map((r) => (
                  <tr key={r.line} className={r.problems.length ? "bg-notyet-100" : ""}>
                    <td className="num">{r.line}</td>
                    <td>{r.name || "—"}</td>
                    <td className="break-all">{r.email || "—"}</td>
                    <td>{r.cohort || "—"}</td>
                    <td>
                      {r.sponsorName}
                      {r.sponsorEmail ? ` <${r.sponsorEmail}>` : ""}
                    </td>
                    <td>{r.problems.length ? r.problems.join("; ") : "Ready"}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </ScrollArea>
          <button type="button" className="btn-primary" disabled={blocked || busy} onClick={onImport}>
            Import {preview.rows.length} students
          </button>
        </>
      )}
    </section>
  );
}
