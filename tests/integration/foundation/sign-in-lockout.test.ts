// Sign-in abuse limits: 10 consecutive failures for one (e-mail, address) pair lock that pair for
// 15 minutes; unknown e-mails are counted and answered exactly like wrong passwords. Time is
// moved with the injectable clock, never by sleeping.
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { attemptSignIn, MAX_FAILURES, LOCK_MINUTES } from "@/db/access/people/sign-in";
import { unlockAccount, listLockedAccounts } from "@/db/access/people/sign-in-locks";
import { setActive } from "@/db/access/people/account-changes";
import { fixedClock, resetClock } from "@/lib/clock";
import { makeSchool, closeDb, TEST_PASSWORD } from "@/tests/helpers/factories";

afterAll(closeDb);
afterEach(resetClock);

const START = new Date("2026-11-02T09:00:00Z");
const MIN = 60_000;

async function throttle(email: string, address: string) {
  const [row] = await sequelize.query<{ failures: number; locked_until: Date | null }>(
    `SELECT failures, locked_until FROM sign_in_throttle WHERE email = :email AND address = :address`,
    { replacements: { email: email.toLowerCase(), address }, type: QueryTypes.SELECT },
  );
  return row ?? null;
}

async function fail(email: string, address: string, times: number) {
  for (let i = 0; i < times; i++) expect(await attemptSignIn(email, "wrong-password-xyz", address)).toBeNull();
}

let s: Awaited<ReturnType<typeof makeSchool>>;
let email: (i: number) => string;
beforeAll(async () => {
  s = await makeSchool("lockout");
  email = (i) => s.people.students[i]!.email;
});

test("the limits are the ones the product promises", () => {
  expect(MAX_FAILURES).toBe(10);
  expect(LOCK_MINUTES).toBe(15);
});

test("nine failures do not lock; a right password then signs in and clears the count", async () => {
  fixedClock(START);
  await fail(email(0), "198.51.100.1", 9);
  expect((await throttle(email(0), "198.51.100.1"))?.failures).toBe(9);
  const ok = await attemptSignIn(email(0), TEST_PASSWORD, "198.51.100.1");
  expect(ok?.id).toBe(s.people.students[0]!.id);
  expect(await throttle(email(0), "198.51.100.1")).toBeNull();
});

test("the tenth failure locks the pair for 15 minutes, even against the right password; other addresses are not locked", async () => {
  const clock = fixedClock(START);
  const e = email(1);
  await fail(e, "198.51.100.2", 10);
  const row = await throttle(e, "198.51.100.2");
  expect(row?.locked_until?.toISOString()).toBe(new Date(START.getTime() + 15 * MIN).toISOString());
  // the 11th attempt, with the right password, is refused
  expect(await attemptSignIn(e, TEST_PASSWORD, "198.51.100.2")).toBeNull();
  // attempts while locked do not extend the lock
  expect((await throttle(e, "198.51.100.2"))?.locked_until?.toISOString()).toBe(row?.locked_until?.toISOString());
  // the same account from another address is a different pair
  expect((await attemptSignIn(e, TEST_PASSWORD, "198.51.100.99"))?.id).toBe(s.people.students[1]!.id);
  // one millisecond before the end: still locked
  clock.advanceMs(15 * MIN - 1);
  expect(await attemptSignIn(e, TEST_PASSWORD, "198.51.100.2")).toBeNull();
  // at the end: the right password works again
  clock.advanceMs(1);
  expect((await attemptSignIn(e, TEST_PASSWORD, "198.51.100.2"))?.id).toBe(s.people.students[1]!.id);
});

test("after a lock expires, counting starts again from one", async () => {
  const clock = fixedClock(START);
  const e = email(2);
  await fail(e, "198.51.100.3", 10);
  clock.advanceMs(16 * MIN);
  await fail(e, "198.51.100.3", 1);
  const row = await throttle(e, "198.51.100.3");
  expect(row?.failures).toBe(1);
  expect(row?.locked_until).toBeNull();
});

test("unknown e-mails are counted and locked exactly like wrong passwords", async () => {
  fixedClock(START);
  const unknown = `nobody-${s.tag}@chalkwing.test`;
  await fail(unknown, "198.51.100.4", 9);
  expect(await throttle(unknown, "198.51.100.4")).toMatchObject({ failures: 9, locked_until: null });
  await fail(unknown, "198.51.100.4", 1);
  expect((await throttle(unknown, "198.51.100.4"))?.locked_until?.toISOString()).toBe(new Date(START.getTime() + 15 * MIN).toISOString());
});

test("e-mail case and spaces do not make a new pair", async () => {
  fixedClock(START);
  const e = email(3);
  await fail(`  ${e.toUpperCase()} `, "198.51.100.5", 10);
  expect(await attemptSignIn(e, TEST_PASSWORD, "198.51.100.5")).toBeNull();
});

test("the chief's unlock lifts every lock on the account, and only in their own school", async () => {
  fixedClock(START);
  const e = email(4);
  await fail(e, "198.51.100.6", 10);
  await fail(e, "198.51.100.7", 10);
  expect((await listLockedAccounts(s.school.id)).filter((l) => l.personId === s.people.students[4]!.id)).toHaveLength(2);
  const other = await makeSchool("lockout-other");
  expect(await unlockAccount(other.school.id, s.people.students[4]!.id)).toBe(0);
  expect(await attemptSignIn(e, TEST_PASSWORD, "198.51.100.6")).toBeNull();
  expect(await unlockAccount(s.school.id, s.people.students[4]!.id)).toBe(2);
  expect((await attemptSignIn(e, TEST_PASSWORD, "198.51.100.6"))?.id).toBe(s.people.students[4]!.id);
});

test("an inactive account answers like a wrong password", async () => {
  fixedClock(START);
  await setActive(s.school.id, s.people.students[5]!.id, false);
  expect(await attemptSignIn(email(5), TEST_PASSWORD, "198.51.100.8")).toBeNull();
  expect((await throttle(email(5), "198.51.100.8"))?.failures).toBe(1);
});
