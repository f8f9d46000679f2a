// A sonographer's question reaches the reviewer, who answers it with the keyboard. Set-up goes
// through the API: the QA lead turns double reads off (one read settles the exam), the demo
// sonographer submits an ocular exam with one clip (no demo exam uses that application, so
// the queue hands the reviewer exactly this one), the demo reviewer claims and scores it and
// the sonographer asks a question. In the browser the reviewer sees the thread "Awaiting your
// answer" under Questions, opens the bell's notification, reads the question beside their
// own review, types an answer and sends it with Ctrl+Enter. The API then shows the answer in
// the sonographer's feedback thread.
import fs from "node:fs";
import { expect, test, type Page } from "@playwright/test";
import { fixtureDir, h264Mp4 } from "../api/media-fixtures";
import { apiAs, PASSWORD, scores, shot } from "./support";

const LEAD = "lead@cedarhollow.example";
const REVIEWER = "reviewer@cedarhollow.example";
const SONOGRAPHER = "sonographer@cedarhollow.example";
const APP = "ocular";
const FEEDBACK = "Lower the depth so the globe fills the screen.";
const QUESTION = "Would 4 cm have been enough depth for the optic nerve sheath?";
const ANSWER = "Yes: 4 to 5 cm shows the sheath well behind the globe.";

async function signIn(page: Page, email: string) {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(PASSWORD);
  await page.getByLabel("Password").press("Enter");
  await expect(page.getByRole("heading", { level: 1, name: "Home" })).toBeVisible();
}

test("a reviewer reads a sonographer's question from the bell and answers it with the keyboard", async ({ page, baseURL }, testInfo) => {
  test.setTimeout(90_000);
  const lead = await apiAs(baseURL!, LEAD);
  const before = (await (await lead.get("/api/settings")).json()).settings.doubleReadShare;
  expect((await lead.patch("/api/settings", { data: { doubleReadShare: 0 } })).ok()).toBe(true);

  try {
    // --- The sonographer submits an ocular exam with one processed clip.
    const sono = await apiAs(baseURL!, SONOGRAPHER);
    const apps = await (await sono.get("/api/applications")).json();
    const ocular = apps.applications.find((a: { code: string }) => a.code === APP);
    expect(ocular, "the ocular application").toBeTruthy();
    const created = await sono.post("/api/exams", {
      data: {
        applicationCode: APP,
        performedAt: new Date(Date.now() - 30 * 60_000).toISOString(),
        setting: "educational",
        transducer: "linear",
        preset: "Ocular",
        indication: "Practice scan",
        findings: ocular.findings.map((f: { key: string }) => ({ key: f.key, read: "negative" })),
      },
    });
    expect(created.status(), await created.text()).toBe(201);
    const { exam } = (await created.json()) as { exam: { id: string; code: string } };
    const file = h264Mp4(fixtureDir(), "globe.mp4", { seconds: 1, seed: 57 });
    const upload = await sono.post(`/api/exams/${exam.id}/clips`, {
      multipart: { file: { name: "globe.mp4", mimeType: "video/mp4", buffer: fs.readFileSync(file) }, view: ocular.views[0].key },
    });
    expect(upload.status()).toBe(202);
    await expect
      .poll(async () => (await (await sono.get(`/api/exams/${exam.id}`)).json()).exam.clips.map((c: { state: string }) => c.state).join(","), {
        timeout: 30_000,
      })
      .toBe("ready");
    expect((await sono.post(`/api/exams/${exam.id}/submit`, { data: { attestNoIdentifiers: true } })).ok()).toBe(true);

    // --- The reviewer claims it (the only ocular read waiting) and scores it.
    const reviewer = await apiAs(baseURL!, REVIEWER);
    const claim = await reviewer.post("/api/queue/next", { data: { application: APP } });
    expect(claim.status(), "the ocular read should be waiting").toBe(200);
    const ws = (await claim.json()) as { assignment: { id: string }; exam: { id: string } };
    expect(ws.exam.id, "the queue hands out this test's exam").toBe(exam.id);
    const review = await reviewer.post(`/api/assignments/${ws.assignment.id}/review`, {
      data: { scores: scores("4"), reads: ocular.findings.map((f: { key: string }) => ({ key: f.key, read: "negative" })), feedback: FEEDBACK },
    });
    expect(review.status(), await review.text()).toBe(201);

    // --- The sonographer asks.
    const ask = await sono.post(`/api/exams/${exam.id}/messages`, { data: { body: QUESTION } });
    expect(ask.status(), await ask.text()).toBe(201);

    // --- The reviewer in the browser: the thread waits under Questions.
    await signIn(page, REVIEWER);
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Questions" }).click();
    await expect(page.getByRole("heading", { level: 1, name: "Questions" })).toBeVisible();
    const row = page.getByRole("row").filter({ has: page.getByRole("link", { name: exam.code }) });
    await expect(row.getByText("Awaiting your answer")).toBeVisible();

    // The bell's notification leads to the exam.
    await page.getByRole("button", { name: /Notifications, [1-9]\d* unread/ }).click();
    await page.getByRole("button", { name: new RegExp(`A question about exam ${exam.code}`) }).click();
    await expect(page).toHaveURL(new RegExp(`/reviews/exams/${exam.id}$`));
    await expect(page.getByRole("heading", { level: 1 })).toHaveText(`Question about exam ${exam.code}`);
    await expect(page.getByText("Ocular ·")).toBeVisible();
    // My own review beside the question: written feedback, levels, reads; the sonographer stays blinded.
    const myReview = page.getByRole("region", { name: "Your review" });
    await expect(myReview.getByText(FEEDBACK)).toBeVisible();
    await expect(myReview.getByRole("row", { name: /Overall image quality/ }).getByRole("cell")).toHaveText("4");
    await expect(myReview.getByText("Retinal detachment")).toBeVisible();
    const thread = page.getByRole("list", { name: "Messages, oldest first" });
    await expect(thread.getByRole("listitem")).toHaveCount(1);
    await expect(thread.getByRole("listitem").first()).toContainText("Clinician");
    await expect(thread.getByRole("listitem").first()).toContainText(QUESTION);

    // The answer, by keyboard: focus the box, type, Ctrl+Enter. An empty box is named next to the
    // field; a refusal shows the server's own message there and keeps the text.
    const box = page.getByRole("textbox", { name: "Your answer" });
    await box.focus();
    await page.keyboard.press("Control+Enter");
    await expect(page.getByText("Write your answer")).toBeVisible();
    const refusal = "Questions open once the feedback is final";
    await page.route("**/api/exams/*/messages", (route) =>
      route.request().method() === "POST" ? route.fulfill({ status: 409, json: { error: { code: "not_reviewed", message: refusal } } }) : route.continue(),
    );
    await page.keyboard.type(ANSWER);
    await page.keyboard.press("Control+Enter");
    await expect(page.getByText(refusal)).toBeVisible();
    await expect(box).toHaveAttribute("aria-describedby", /answer-error/);
    await expect(box).toHaveValue(ANSWER);
    await page.unroute("**/api/exams/*/messages");
    await expect(box).toBeFocused();
    await page.keyboard.press("Control+Enter");
    await expect(thread.getByRole("listitem")).toHaveCount(2);
    await expect(thread.getByRole("listitem").nth(1)).toContainText("You");
    await expect(thread.getByRole("listitem").nth(1)).toContainText(ANSWER);
    await expect(box).toHaveValue("");
    await expect(box).toBeFocused();
    await shot(page, testInfo, "question-answered");

    // The Questions list now shows the thread answered.
    await page.getByRole("link", { name: "All questions" }).click();
    await expect(row.getByText("Answered")).toBeVisible();
    await expect(row.getByText("Awaiting your answer")).toHaveCount(0);

    // --- The sonographer's thread holds the answer (the API, not the screen, says so).
    const fb = await (await sono.get(`/api/me/feedback/${exam.id}`)).json();
    expect(fb.messages.map((m: { body: string }) => m.body)).toEqual([QUESTION, ANSWER]);
    expect(fb.messages[1].author).not.toBe("you");
    expect(fb.messages[0].author).toBe("you");
  } finally {
    await lead.patch("/api/settings", { data: { doubleReadShare: before } });
  }
});
