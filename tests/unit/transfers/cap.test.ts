import { checkTransferCredit, transferCapMinutes } from "@/lib/transfers/cap";

// Transfer credit caps, 14 CFR 141.77(c): at most 50% of the course's ground training from an
// approved course ((c)(1)), at most 25% otherwise ((c)(2)).

const none = { approvedMinutes: 0, notApprovedMinutes: 0 };

describe("transfer credit caps (14 CFR 141.77(c))", () => {
  it("caps an approved course's credit at 50% and another's at 25%", () => {
    expect(transferCapMinutes(2100, true)).toBe(1050);
    expect(transferCapMinutes(2100, false)).toBe(525);
    // whole minutes, rounded down so the cap is never exceeded
    expect(transferCapMinutes(2101, false)).toBe(525);
  });

  it("accepts exactly the cap and refuses one minute over, naming the field and the cap", () => {
    expect(checkTransferCredit(2100, none, { approved: true, minutes: 1050 })).toEqual({ ok: true, capMinutes: 1050 });
    const over = checkTransferCredit(2100, none, { approved: true, minutes: 1051 });
    expect(over.ok).toBe(false);
    expect(!over.ok && over.message).toMatch(/^creditedMinutes: at most 1050 minutes .* 50% .*141\.77\(c\)/);
    expect(checkTransferCredit(2100, none, { approved: false, minutes: 525 }).ok).toBe(true);
    const overNot = checkTransferCredit(2100, none, { approved: false, minutes: 526 });
    expect(!overNot.ok && overNot.message).toMatch(/at most 525 minutes .* 25%/);
  });

  it("counts earlier credits: the total stays within 50%, and credits from courses not approved within 25%", () => {
    const prior = { approvedMinutes: 600, notApprovedMinutes: 300 };
    expect(checkTransferCredit(2100, prior, { approved: true, minutes: 150 }).ok).toBe(true);
    const r = checkTransferCredit(2100, prior, { approved: true, minutes: 151 });
    expect(!r.ok && r.roomMinutes).toBe(150);
    expect(!r.ok && r.message).toMatch(/900 already credited, 150 left/);
    expect(checkTransferCredit(2100, prior, { approved: false, minutes: 225 }).ok).toBe(true);
    expect(checkTransferCredit(2100, prior, { approved: false, minutes: 226 }).ok).toBe(false);
  });

  it("refuses a minimum that is not a whole number of minutes", () => {
    expect(() => transferCapMinutes(-1, true)).toThrow(/minimumMinutes/);
  });
});
