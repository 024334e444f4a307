import { createHash } from "node:crypto";
import { formatDay, formatDayTime, hoursLabel } from "@/lib/time";
import { ATTENDANCE_WORDS, SIGN_OFF_STATE_WORDS, STAGE_RESULT_WORDS, words, codeToWords } from "@/lib/labels";
import {
  LEVEL_LABEL,
  OUTCOME_LABEL,
  CHECK_OUTCOME_LABEL,
  type CheckOutcome,
  type LevelOfLearning,
  type QuestionOutcome,
} from "@/lib/records/outcome";
import { PASS_RATE_TARGET_PERCENT } from "@/lib/endorsements/rules";
import { RETENTION_RULES, type RetentionRule, type RetentionState } from "@/lib/retention/rules";
import type { PackDocument, PackSection } from "./document";

// The inspection pack's content, from plain values gathered by db/access/inspection: what an
// inspector reads for one student, section by section, worded and dated for print. Pure.

export interface PackInput {
  school: { name: string; timeZone: string; certificateNumber: string | null };
  student: {
    name: string;
    email: string;
    courseCode: string;
    courseTitle: string;
    minGroundMinutes: number;
    enrolledOn: string;
    cohortName: string | null;
    leadInstructorName: string | null;
    ended: { on: string; kind: string | null; reason: string | null } | null;
  };
  syllabus: { number: number; approvedOn: string | null; effectiveFrom: string | null; changeNote: string };
  groundMinutes: number;
  groundLog: { date: string; title: string; status: string; minutes: number; instructorName: string | null }[];
  checks: {
    occurredAt: Date;
    itemCodes: string[];
    outcome: CheckOutcome;
    levelShown: LevelOfLearning;
    instructorName: string;
    durationMinutes: number;
    withdrawn: { reason: string } | null;
    amendedBy: string | null;
    questions: { position: number; itemCode: string; text: string; outcome: QuestionOutcome; prompted: boolean }[];
  }[];
  signOffs: {
    itemCode: string;
    itemTitle: string;
    signedOn: string;
    signerName: string;
    certificateNumber: string | null;
    state: string;
  }[];
  stageChecks: {
    stageCode: string;
    date: string;
    examinerName: string;
    certificateNumber: string | null;
    result: string;
    written: string | null;
  }[];
  endorsements: {
    endorsedOn: string;
    attempt: number;
    authorityName: string;
    instructorName: string;
    statement: string;
    auditHash: string;
    result: {
      takenOn: string;
      scorePercent: number;
      passMarkPercent: number;
      passed: boolean;
      validUntil: string | null;
      areasMissed: string[];
    } | null;
  }[];
  certification: {
    purpose: string;
    certifierName: string;
    certifierCertificate: string | null;
    statement: string;
    certifiedOn: string;
    auditHash: string;
  } | null;
  chain: {
    ok: boolean;
    checked: number;
    headHash: string;
    headPosition: number;
    /** the hash of the last row that links up (the head when ok) */
    lastGoodHash: string;
    broken: { position: number; problem: string } | null;
    /** positions 1..through verified by the full walk that ended at finishedAt, the rest as the pack was made; null: all walked for the pack */
    basis: { through: number; finishedAt: Date; requestedBy: string | null } | null;
  };
  /** credit from earlier schools (transfer in), oldest first */
  transferCredits: {
    sourceSchool: string;
    sourceApproved: boolean;
    creditedMinutes: number;
    capMinutes: number;
    testKind: string;
    testTakenOn: string;
    testResult: string;
    itemCodes: string[];
    evidenceFileName: string;
    evidenceSha256: string;
    recordedByName: string;
    recordedOn: string;
    auditHash: string;
  }[];
  /** how long the record is kept (lib/retention/rules.ts); null when the student has no enrolment on file */
  retention: {
    endedOn: string | null;
    keepUntil: string | null;
    governing: RetentionRule[];
    state: RetentionState;
    hold: { reason: string; setOn: string; setByName: string } | null;
    archived: { on: string; byName: string } | null;
  } | null;
  instructors: InstructorFile[];
  passRate: {
    window: { from: string; to: string };
    rows: { courseCode: string; courseTitle: string; firstAttempts: number; passed: number; ratePercent: number | null }[];
  };
}

export interface InstructorFile {
  name: string;
  /** what this instructor did in the student's training: taught, checked, signed, examined, endorsed, certified */
  parts: string[];
  versions: {
    version: number;
    certificateKind: string;
    certificateNumber: string;
    ratings: string[];
    checkInstructor: boolean;
    issuedOn: string;
    recencyOn: string;
    recencyMonths: number;
    validFrom: string;
    validTo: string | null;
    changeNote: string;
    recordedByName: string | null;
  }[];
  courses: { code: string; validFrom: string | null; validTo: string | null }[];
  /** per qualification in force today: the day recency runs out */
  recency: { certificateNumber: string; dueOn: string; current: boolean }[];
  briefingsTaught: { title: string; sessions: number; firstOn: string; lastOn: string }[];
}

const day = (d: string | null) => (d ? formatDay(d) : "none");

/** How the chain's verification was reached: on a full walk, or walked whole for this pack. */
function chainBasisWords(c: PackInput["chain"], tz: string): string {
  if (!c.basis) return "The whole chain was walked from its first event as this pack was made.";
  const walk = `the full walk of the chain that ended ${formatDayTime(c.basis.finishedAt, tz)}${c.basis.requestedBy ? ` (asked for by ${c.basis.requestedBy})` : ""}`;
  const rest =
    c.checked > c.basis.through || !c.ok
      ? `; the events after it were checked from that walk's last hash as this pack was made`
      : `; its last hash was found again at position ${c.basis.through} as this pack was made, and no event has been written since`;
  return `Positions 1 to ${c.basis.through} were verified by ${walk}${rest}.`;
}

export function packDocument(p: PackInput): PackDocument {
  const tz = p.school.timeZone;
  const s = p.student;
  const sections: PackSection[] = [];

  sections.push({
    heading: "Enrolment",
    blocks: [
      { kind: "text", text: `Student: ${s.name} (${s.email})` },
      { kind: "text", text: `Course: ${s.courseCode} ${s.courseTitle}` },
      {
        kind: "text",
        text: `Enrolled on ${formatDay(s.enrolledOn)}; cohort ${s.cohortName ?? "none"}; lead instructor ${s.leadInstructorName ?? "none"}`,
      },
      {
        kind: "text",
        text: s.ended
          ? `Training ended on ${formatDay(s.ended.on)}: ${s.ended.kind ? codeToWords(s.ended.kind) : "ended"}${s.ended.reason ? ` (${s.ended.reason})` : ""}`
          : "Training in progress (enrolment active)",
      },
    ],
  });

  sections.push({
    heading: "Syllabus revision",
    blocks: [
      {
        kind: "text",
        text: `Revision ${p.syllabus.number} of ${s.courseCode}: approved ${day(p.syllabus.approvedOn)}, effective from ${day(p.syllabus.effectiveFrom)}`,
      },
      ...(p.syllabus.changeNote ? [{ kind: "text" as const, text: `Change note: ${p.syllabus.changeNote}` }] : []),
    ],
  });

  sections.push({
    heading: "Transfer-in credit",
    blocks: p.transferCredits.length
      ? p.transferCredits.flatMap((t) => [
          {
            kind: "text" as const,
            bold: true,
            text:
              `${t.sourceSchool} (${t.sourceApproved ? "approved course" : "course not approved"}): ${hoursLabel(t.creditedMinutes)} credited ` +
              `of a cap of ${hoursLabel(t.capMinutes)} (14 CFR 141.77(c))`,
          },
          { kind: "text" as const, indent: true, text: `Items credited: ${t.itemCodes.join(", ") || "none"}` },
          {
            kind: "text" as const,
            indent: true,
            text: `Test given by this school: ${codeToWords(t.testKind)}, taken on ${formatDay(t.testTakenOn)}: ${t.testResult}`,
          },
          {
            kind: "text" as const,
            indent: true,
            text: `Recorded on ${formatDay(t.recordedOn)} by ${t.recordedByName}; evidence ${t.evidenceFileName}`,
          },
          { kind: "text" as const, indent: true, mono: true, text: `Evidence SHA-256 ${t.evidenceSha256}` },
          { kind: "text" as const, indent: true, mono: true, text: `Audit chain event ${t.auditHash}` },
        ])
      : [{ kind: "text", text: "None: no credit from an earlier school." }],
  });

  sections.push({
    heading: "Ground log",
    blocks: [
      {
        kind: "text",
        bold: true,
        text: `Credited ground time: ${hoursLabel(p.groundMinutes, s.minGroundMinutes)}${p.transferCredits.length ? " (including transfer-in credit)" : ""}`,
      },
      {
        kind: "table",
        header: ["Date", "Session", "Instructor", "Attendance", "Credited"],
        widths: [0.17, 0.37, 0.18, 0.16, 0.12],
        rows: p.groundLog.map((g) => [
          formatDay(g.date),
          g.title,
          g.instructorName ?? "",
          words(ATTENDANCE_WORDS, g.status),
          hoursLabel(g.minutes),
        ]),
      },
    ],
  });

  sections.push({
    heading: "Oral checks",
    blocks: p.checks.length
      ? p.checks.flatMap((c) => [
          {
            kind: "text" as const,
            bold: true,
            text:
              `${formatDayTime(c.occurredAt, tz)} · ${c.itemCodes.join(", ")} · ${CHECK_OUTCOME_LABEL[c.outcome]} · ` +
              `level of learning shown: ${LEVEL_LABEL[c.levelShown]} · ${c.durationMinutes} min · ${c.instructorName}` +
              `${c.withdrawn ? ` · WITHDRAWN: ${c.withdrawn.reason}` : ""}${c.amendedBy ? " · amended by a later check" : ""}`,
          },
          ...c.questions.map((q) => ({
            kind: "text" as const,
            indent: true,
            text: `${q.position}. [${q.itemCode}] ${q.text} - ${OUTCOME_LABEL[q.outcome]}${q.prompted ? ", prompted" : ""}`,
          })),
        ])
      : [{ kind: "text", text: "None." }],
  });

  sections.push({
    heading: "Sign-offs",
    blocks: [
      {
        kind: "table",
        header: ["Item", "Signed for", "Signer", "Certificate", "State"],
        widths: [0.36, 0.16, 0.18, 0.16, 0.14],
        rows: p.signOffs.map((x) => [
          `${x.itemCode} ${x.itemTitle}`,
          formatDay(x.signedOn),
          x.signerName,
          x.certificateNumber ?? "none on that date",
          words(SIGN_OFF_STATE_WORDS, x.state),
        ]),
      },
    ],
  });

  sections.push({
    heading: "Stage checks",
    blocks: [
      {
        kind: "table",
        header: ["Stage", "Date", "Examiner", "Certificate", "Result", "Written / oral"],
        widths: [0.08, 0.16, 0.16, 0.14, 0.1, 0.36],
        rows: p.stageChecks.map((x) => [
          x.stageCode,
          formatDay(x.date),
          x.examinerName,
          x.certificateNumber ?? "none on that date",
          words(STAGE_RESULT_WORDS, x.result),
          x.written ?? "",
        ]),
      },
    ],
  });

  sections.push({
    heading: "Knowledge-test endorsements and results",
    blocks: p.endorsements.length
      ? p.endorsements.flatMap((e) => [
          {
            kind: "text" as const,
            bold: true,
            text: `Attempt ${e.attempt}: endorsed on ${formatDay(e.endorsedOn)} by ${e.instructorName} for the ${e.authorityName} knowledge test`,
          },
          { kind: "text" as const, indent: true, text: e.statement },
          {
            kind: "text" as const,
            indent: true,
            text: e.result
              ? `Result: taken on ${formatDay(e.result.takenOn)}, score ${e.result.scorePercent} % (pass mark ${e.result.passMarkPercent} %): ` +
                (e.result.passed ? `Passed, valid until ${day(e.result.validUntil)}` : "Not passed") +
                (e.result.areasMissed.length ? `; knowledge areas missed: ${e.result.areasMissed.join(", ")}` : "")
              : "Result: not yet recorded",
          },
          { kind: "text" as const, indent: true, mono: true, text: `Audit chain event ${e.auditHash}` },
        ])
      : [{ kind: "text", text: "None." }],
  });

  const c = p.certification;
  sections.push({
    heading: "Certification of the record",
    blocks: c
      ? [
          { kind: "text", text: `${codeToWords(c.purpose)}: certified on ${formatDay(c.certifiedOn)} by ${c.certifierName}` },
          { kind: "text", text: `Certificate number: ${c.certifierCertificate ?? "none recorded"}` },
          { kind: "text", text: c.statement },
          { kind: "text", mono: true, text: `Signed with password re-entry; audit chain event ${c.auditHash}` },
        ]
      : [{ kind: "text", text: "Not certified: the record is certified by the chief instructor when training ends." }],
  });

  sections.push({ heading: "Retention of the record", blocks: retentionBlocks(p.retention) });

  sections.push({
    heading: CHAIN_SECTION_HEADING,
    blocks: [
      {
        kind: "text",
        bold: true,
        text: p.chain.ok
          ? `Verified: all ${p.chain.checked} events of the school's chain link up from the first to the head.`
          : `NOT VERIFIED: the chain breaks at position ${p.chain.broken?.position ?? "?"} (${p.chain.broken?.problem ?? "unknown"}); ${p.chain.checked} events before it link up.`,
      },
      { kind: "text", text: chainBasisWords(p.chain, p.school.timeZone) },
      { kind: "text", text: `Head of the chain: position ${p.chain.headPosition}` },
      { kind: "text", mono: true, text: `Head hash ${p.chain.headHash}` },
      ...(p.chain.ok ? [] : [{ kind: "text" as const, mono: true, text: `Last link that verifies ${p.chain.lastGoodHash}` }]),
    ],
  });

  sections.push({
    heading: "Instructor files",
    blocks: p.instructors.length
      ? p.instructors.flatMap((i) => instructorBlocks(i))
      : [{ kind: "text", text: "No instructor has taught, checked or signed for this student yet." }],
  });

  sections.push({
    heading: "First-attempt pass rate",
    blocks: [
      {
        kind: "text",
        text:
          `Knowledge tests per course, each student's first result only, taken from ${formatDay(p.passRate.window.from)} to ` +
          `${formatDay(p.passRate.window.to)} (the last 24 calendar months). A school keeps ${PASS_RATE_TARGET_PERCENT} % or better (14 CFR 141.5(d)).`,
      },
      {
        kind: "table",
        header: ["Course", "First attempts", "Passed", "Rate"],
        widths: [0.46, 0.18, 0.14, 0.22],
        rows: p.passRate.rows.map((r) => [
          `${r.courseCode} ${r.courseTitle}`,
          String(r.firstAttempts),
          String(r.passed),
          passRateWords(r.ratePercent),
        ]),
      },
    ],
  });

  return {
    title: `Inspection pack: ${s.name}`,
    schoolName: p.school.certificateNumber ? `${p.school.name} (certificate ${p.school.certificateNumber})` : p.school.name,
    sections,
  };
}

export function passRateWords(ratePercent: number | null): string {
  if (ratePercent === null) return "No tests";
  return `${ratePercent} %${ratePercent < PASS_RATE_TARGET_PERCENT ? ` (below ${PASS_RATE_TARGET_PERCENT} %)` : ""}`;
}

function retentionBlocks(r: PackInput["retention"]): PackSection["blocks"] {
  if (!r) return [{ kind: "text", text: "No enrolment on file." }];
  if (!r.endedOn || !r.keepUntil)
    return [{ kind: "text", text: "Training has not ended: the retention date is counted from the end of training." }];
  const rules = r.governing.map(
    (g) => `${RETENTION_RULES[g].source}, ${RETENTION_RULES[g].years} year${RETENTION_RULES[g].years === 1 ? "" : "s"}`,
  );
  const out: PackSection["blocks"] = [
    {
      kind: "text",
      bold: true,
      text: `Kept until ${formatDay(r.keepUntil)}: ${formatDay(r.endedOn)}, the end of training, plus the longest rule that applies (${rules.join("; ")})`,
    },
  ];
  if (r.hold) out.push({ kind: "text", text: `Legal hold since ${formatDay(r.hold.setOn)} (${r.hold.setByName}): ${r.hold.reason}` });
  if (r.archived)
    out.push({ kind: "text", text: `Marked archived on ${formatDay(r.archived.on)} by ${r.archived.byName}; nothing is deleted.` });
  else if (r.state === "due")
    out.push({ kind: "text", text: "Past its retention date: listed for the chief instructor to archive; nothing is deleted." });
  return out;
}

function instructorBlocks(i: InstructorFile): PackSection["blocks"] {
  return [
    { kind: "text", bold: true, text: `${i.name} (${i.parts.join(", ")})` },
    {
      kind: "text",
      indent: true,
      text: i.recency.length
        ? `Recency: ${i.recency.map((r) => `${r.certificateNumber} ${r.current ? "current, recency runs out on" : "not current, recency ran out on"} ${formatDay(r.dueOn)}`).join("; ")}`
        : "Recency: no qualification in force today",
    },
    {
      kind: "table",
      header: ["Version", "Certificate", "Ratings", "In force", "Recency", "Change"],
      widths: [0.09, 0.22, 0.14, 0.22, 0.15, 0.18],
      rows: i.versions.map((v) => [
        String(v.version),
        `${v.certificateKind} ${v.certificateNumber}${v.checkInstructor ? " (check instructor)" : ""}, issued ${formatDay(v.issuedOn)}`,
        v.ratings.join(", ") || "none",
        `${formatDay(v.validFrom)} to ${v.validTo ? formatDay(v.validTo) : "today"}`,
        `${formatDay(v.recencyOn)} + ${v.recencyMonths} months`,
        `${v.changeNote || "first entry"}${v.recordedByName ? ` (${v.recordedByName})` : ""}`,
      ]),
    },
    {
      kind: "text",
      indent: true,
      text: `Courses: ${i.courses.map((c) => `${c.code} from ${c.validFrom ? formatDay(c.validFrom) : "the start"}${c.validTo ? ` to ${formatDay(c.validTo)}` : ""}`).join("; ") || "none"}`,
    },
    {
      kind: "text",
      indent: true,
      text: `Briefings taught: ${
        i.briefingsTaught
          .map(
            (b) =>
              `${b.title} (${b.sessions} session${b.sessions === 1 ? "" : "s"}, ${formatDay(b.firstOn)}${b.lastOn !== b.firstOn ? ` to ${formatDay(b.lastOn)}` : ""})`,
          )
          .join("; ") || "none"
      }`,
    },
  ];
}

/** The section the record hash leaves out: the school's chain moves with every event of any student. */
export const CHAIN_SECTION_HEADING = "Audit chain verification";

/**
 * The record hash: SHA-256 over the pack's content as printed (title, school and every section's
 * text and table cells, in order), not counting the page numbers, the time it was made and the
 * audit chain's verification (its head moves with every event written for any student of the
 * school), so the same record gives the same hash whenever the pack is made.
 */
export function recordHash(doc: PackDocument): string {
  const content = { ...doc, sections: doc.sections.filter((x) => x.heading !== CHAIN_SECTION_HEADING) };
  return createHash("sha256").update(JSON.stringify(content)).digest("hex");
}

export const RECORD_HASH_BASIS =
  "The record hash is SHA-256 over this pack's content as printed (title, school and every section's text and table cells, in order), " +
  "not counting the page numbers, the time it was made and the audit chain verification, printed apart with the chain's head hash.";
