/** @jest-environment node */
// The e2e screenshot helper asks again only when Chromium's compositor answers "Unable to capture
// screenshot" (a transient answer, seen once in CI), and at most three times; any other error fails at once.
import type { Page } from "playwright-core";
import { captureScreenshot } from "../../e2e/helpers/browser";

function fakePage(answers: (Error | Buffer)[]) {
  const calls = { screenshot: 0, evaluate: 0 };
  const page = {
    screenshot: async () => {
      const next = answers[calls.screenshot++];
      if (next instanceof Error) throw next;
      return next;
    },
    evaluate: async () => {
      calls.evaluate++;
    },
  } as unknown as Page;
  return { page, calls };
}

const unable = () => new Error("page.screenshot: Protocol error (Page.captureScreenshot): Unable to capture screenshot");

test("a transient capture failure is asked again after two frames", async () => {
  const png = Buffer.from("png");
  const { page, calls } = fakePage([unable(), png]);
  await expect(captureScreenshot(page, { fullPage: true })).resolves.toBe(png);
  expect(calls).toEqual({ screenshot: 2, evaluate: 1 });
});

test("three transient failures running fail the test", async () => {
  const { page, calls } = fakePage([unable(), unable(), unable(), Buffer.from("never reached")]);
  await expect(captureScreenshot(page, {})).rejects.toThrow("Unable to capture screenshot");
  expect(calls.screenshot).toBe(3);
});

test("any other error fails at once", async () => {
  const { page, calls } = fakePage([new Error("Target page, context or browser has been closed"), Buffer.from("x")]);
  await expect(captureScreenshot(page, {})).rejects.toThrow("has been closed");
  expect(calls.screenshot).toBe(1);
});
