import { HttpError } from "@/lib/http/errors";

// The Records rules' refusals: each names its reason and the field at fault.

export type RefusalReason =
  | "no_check"
  | "not_meeting_standard"
  | "level_below_required"
  | "check_withdrawn"
  | "check_expired"
  | "makeup_open"
  | "signer_not_qualified"
  | "signer_not_current"
  | "stage_locked"
  | "already_signed"
  | "wrong_password"
  | "not_ready"
  | "examiner_not_allowed"
  | "examiner_is_lead"
  | "written_below_pass_mark";

/** A refusal of the Records rules: 422 (409 for a second sign-off) with a reason code and a message naming the field. */
export class RecordRefusal extends HttpError {
  constructor(
    public reason: RefusalReason,
    message: string,
    field?: string,
  ) {
    super(reason === "already_signed" ? 409 : 422, message, field);
    this.name = "RecordRefusal";
  }
}
