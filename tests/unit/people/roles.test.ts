import { ASSIGNABLE_ROLES, STUDENT_ROLES, managesAccounts, roleChangeProblem } from "@/lib/auth/account-roles";
import { changeRolesSchema, invitePersonSchema } from "@/lib/people/schema";

// Which roles the chief gives and takes on Accounts and roles (issue 13): staff and sponsors, never
// a student's role, which comes with enrolment. Told apart by permission (lib/auth/permissions.ts).

describe("assignable roles", () => {
  it("are every role but the student's", () => {
    expect([...STUDENT_ROLES]).toEqual(["student"]);
    expect([...ASSIGNABLE_ROLES].sort()).toEqual(["chief", "instructor", "sponsor"]);
  });

  it("tell who manages accounts by the people.manage permission", () => {
    expect(managesAccounts(["chief", "instructor"])).toBe(true);
    expect(managesAccounts(["instructor", "sponsor"])).toBe(false);
  });

  it("refuse changing a student's account and giving the student role", () => {
    expect(roleChangeProblem(["student"], ["instructor"])).toMatch(/enrolment/);
    expect(roleChangeProblem(["instructor"], ["instructor", "student"])).toMatch(/Roster/);
    expect(roleChangeProblem(["instructor"], ["chief", "instructor"])).toBeNull();
  });
});

describe("the invitation and role schemas", () => {
  it("accept one role as a string, drop repeats and lower-case the e-mail", () => {
    expect(invitePersonSchema.parse({ name: " Ama Osei ", email: "Ama.Osei@School.TEST", roles: "sponsor" })).toEqual({
      name: "Ama Osei",
      email: "ama.osei@school.test",
      roles: ["sponsor"],
    });
    expect(changeRolesSchema.parse({ personId: "6f1c1a4e-3b0a-4c51-9a55-4a5c1f0b2d11", roles: ["chief", "chief"] }).roles).toEqual([
      "chief",
    ]);
  });

  it("name the field at fault", () => {
    const issues = (v: unknown) => invitePersonSchema.safeParse(v).error?.issues.map((i) => [i.path.join("."), i.message]);
    expect(issues({ name: "A", email: "", roles: ["instructor"] })).toContainEqual(["email", "enter an e-mail address"]);
    expect(issues({ name: "A", email: "a@b.test", roles: [] })).toEqual([["roles", "choose at least one role"]]);
    expect(issues({ name: "A", email: "a@b.test", roles: ["student"] })).toEqual([
      ["roles", "choose instructor, chief instructor or sponsor"],
    ]);
  });
});
