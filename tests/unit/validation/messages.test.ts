// Error messages a user would write: zod issues in plain English (no library wording), field keys
// turned into their words for the screen, and the key kept for code.
import { z } from "zod";
import { apiErrorText, fieldLabel, installUserWords, plainIssueMessage, rowMessage, userMessage } from "@/lib/validation/messages";

installUserWords();

const firstMessage = (schema: z.ZodType, value: unknown) => {
  const r = schema.safeParse(value);
  if (r.success) throw new Error("expected a failure");
  return r.error.issues[0]!.message;
};

describe("zod issues in plain English", () => {
  test.each<[string, z.ZodType, unknown, string]>([
    ["a string over its limit", z.string().max(200), "x".repeat(201), "must be at most 200 characters"],
    ["an empty required string", z.string().min(1), "", "must not be empty"],
    ["a short string", z.string().min(3), "ab", "must be at least 3 characters"],
    ["a number over its limit", z.number().max(100), 101, "must be at most 100"],
    ["a number under its limit", z.number().min(0), -1, "must be at least 0"],
    ["a fraction where a whole number is needed", z.number().int(), 1.5, "must be a whole number"],
    ["text where a number is needed", z.number(), "ten", "must be a number"],
    ["a missing value", z.object({ a: z.string() }), {}, "is required"],
    ["an unknown choice", z.enum(["attended", "late"]), "gone", "must be one of: attended, late"],
    ["a bad e-mail", z.email(), "not-mail", "must be an e-mail address"],
    ["a bad reference", z.uuid(), "42", "is not a valid reference"],
    ["an empty list", z.array(z.string()).min(1), [], "choose at least one"],
  ])("%s", (_name, schema, value, want) => {
    const got = firstMessage(schema, value);
    expect(got).toBe(want);
    expect(got).not.toMatch(/Too big|Too small|expected|Invalid input|<=|>=/);
  });

  test("a schema's own message wins over the plain default", () => {
    expect(firstMessage(z.string().max(5, "at most five letters"), "toolong")).toBe("at most five letters");
  });

  test("custom issues keep their own words", () => {
    expect(plainIssueMessage({ code: "custom", input: 1, path: [] } as never)).toBeUndefined();
  });
});

describe("field keys become words on screens", () => {
  test.each([
    ["dueOn", "Due date"],
    ["writtenScorePercent", "Written score"],
    ["questions.0.questionText", "Question (line 1)"],
    ["lines.2.status", "Status (line 3)"],
    ["someNewThing", "Some new thing"],
    ["", "Form"],
  ])("%s → %s", (key, want) => expect(fieldLabel(key)).toBe(want));

  test("a message prefixed with its key gets the key's words, with or without the field", () => {
    expect(userMessage("dueOn: must be a real date", "dueOn")).toBe("Due date: must be a real date");
    expect(userMessage("writtenScorePercent: 0 to 100")).toBe("Written score: 0 to 100");
    expect(userMessage("Ada Quill is already in this session", "studentIds")).toBe("Ada Quill is already in this session");
    expect(userMessage("line 3: e-mail: not a valid address")).toBe("line 3: e-mail: not a valid address");
  });

  test("an API error body reads as words, with a fallback when there is none", () => {
    expect(apiErrorText({ message: "dueOn: must be today or later", field: "dueOn" }, "x")).toBe("Due date: must be today or later");
    expect(apiErrorText(null, "The sessions could not be loaded")).toBe("The sessions could not be loaded");
  });
});

describe("a wrong row is named by its student", () => {
  const names = ["Ada Quill", "Ben Lark", "Cleo Finch"];
  test("a failure on lines.2 names the third student", () => {
    const failure = {
      message: "Status (line 3): choose attended, late, left early or absent",
      field: "lines.2.status",
      fieldErrors: { "lines.2.status": ["choose attended, late, left early or absent"] },
    };
    expect(rowMessage(failure, (i) => names[i])).toBe("Cleo Finch: Status: choose attended, late, left early or absent");
  });
  test("a failure that is not on a row keeps its message", () => {
    expect(rowMessage({ message: "Session: not found", field: "sessionId" }, (i) => names[i])).toBe("Session: not found");
  });
});
