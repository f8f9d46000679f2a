// What the browser specs share: the demo password, an API session for setting up data as a
// demo person, a screenshot attached to the report, and a read at the ideal level of every
// default criterion but overall quality, and claiming one exam's read from the queue.
import path from "node:path";
import { expect, request, type APIRequestContext, type Page, type TestInfo } from "@playwright/test";

export const PASSWORD = "soundings-demo";

/** An API client signed in as a demo person (the session cookie rides along). */
export async function apiAs(baseURL: string, email: string): Promise<APIRequestContext> {
  const ctx = await request.newContext({ baseURL });
  const res = await ctx.post("/api/auth/login", { data: { email, password: PASSWORD } });
  expect(res.status(), `sign-in of ${email}`).toBe(200);
  return ctx;
}

export async function shot(page: Page, testInfo: TestInfo, name: string, fullPage = true) {
  const file = path.join(testInfo.project.outputDir, `${name}.png`);
  await page.screenshot({ path: file, fullPage });
  await testInfo.attach(name, { path: file, contentType: "image/png" });
}

/** Default-rubric scores at the ideal level everywhere except overall image quality. */
export function scores(quality: string): Record<string, string> {
  return { transducer: "suitable", marker: "follows", depth: "fits", gain: "balanced", plane: "standard", labels: "complete", quality };
}

/** Claims until the queue hands over a read of this exam, releasing anything else it hands out. */
export async function claimExam<W extends { assignment: { id: string }; exam: { id: string } }>(reviewer: APIRequestContext, examId: string): Promise<W> {
  const released: string[] = [];
  for (let i = 0; i < 40; i++) {
    const res = await reviewer.post("/api/queue/next", { data: {} });
    expect(res.status(), "a read should be waiting").toBe(200);
    const ws = (await res.json()) as W;
    if (ws.exam.id === examId) {
      for (const id of released) await reviewer.post(`/api/assignments/${id}/release`);
      return ws;
    }
    released.push(ws.assignment.id);
  }
  throw new Error("The exam never came out of the queue");
}
