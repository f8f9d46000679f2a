// DICOM in the browser (issue 13): the QA lead records a clinician's operator name on People;
// DCMTK's dcmsend, standing in for an ultrasound machine, sends two studies to the program's
// AE title; the clinician finds one matched to them and one unassigned on Received studies,
// sees the de-identified previews, claims the unassigned one, and makes an exam of the matched
// one in one step, whose clip shows the depth, frequency and frames the object carried. A DICOM
// file with no extension dropped on the exam form is recognised by its content.
import { execFile } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import { expect, test, type Page } from "@playwright/test";
import { PASSWORD, shot } from "./support";
import { usMultiframe } from "../fixtures/dicom";
import { demoUid } from "../../seeds/clips/dicom";

const run = promisify(execFile);

async function signIn(page: Page, email: string) {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page.getByRole("heading", { level: 1, name: "Home" })).toBeVisible();
}

test("a machine's studies reach the clinician's received studies and become an exam in one step", async ({ page }, testInfo) => {
  test.setTimeout(90_000);
  const port = process.env.DICOM_PORT;
  expect(port, "the test runner starts the app with DICOM_PORT").toBeTruthy();
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "soundings-dicom-spec-"));
  // A name for this run only, so a rerun on the same database starts from its own studies.
  const tag = Math.random().toString(36).slice(2, 8).toUpperCase();
  const operator = `Hartwell^Noa${tag}`;

  // The QA lead records the operator name Noa Hartwell's machine writes.
  await signIn(page, "lead@cedarhollow.example");
  await page.goto("/setup/people");
  await page.getByRole("button", { name: "DICOM operator names of Noa Hartwell" }).click();
  const dialog = page.getByRole("dialog", { name: "DICOM operator names of Noa Hartwell" });
  await dialog.getByLabel("Operator names, one per line").fill(operator);
  await dialog.getByRole("button", { name: "Save names" }).click();
  await expect(dialog).toBeHidden();
  await expect(page.getByRole("row", { name: /Noa Hartwell/ })).toContainText(operator);

  // The machine sends: one study by that operator, one by a name no one gave.
  const mine = path.join(dir, "mine.dcm");
  const stranger = path.join(dir, "stranger.dcm");
  fs.writeFileSync(mine, usMultiframe({ studyUid: demoUid(), operator, frames: 10, seed: 3 }));
  fs.writeFileSync(stranger, usMultiframe({ studyUid: demoUid(), operator: `Locum^${tag}`, frames: 4, seed: 9 }));
  for (const f of [mine, stranger]) await run("dcmsend", ["-aet", `US_${tag}`, "-aec", "CEDARHOLLOW", "127.0.0.1", port!, f]);

  await page.getByRole("button", { name: /^Account:/ }).click();
  await page.getByRole("button", { name: "Sign out" }).click();
  await expect(page).toHaveURL(/\/sign-in$/);
  await signIn(page, "sonographer@cedarhollow.example");
  await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Received studies" }).click();
  await expect(page.getByRole("heading", { level: 1, name: "Received studies" })).toBeVisible();
  const rows = page.getByRole("row").filter({ hasText: `US_${tag}` });
  await expect(rows).toHaveCount(2);
  const matched = rows.filter({ hasText: "Matched to you" });
  const unassigned = rows.filter({ hasText: "Unassigned" });
  await expect(matched).toContainText("DICOM · 8 cm · 5 MHz · 10 frames");
  await expect(unassigned).toContainText("4 frames");

  // The preview is a real image made from the de-identified object.
  await matched.getByRole("button", { name: /^Preview the study/ }).click();
  const preview = page.getByRole("img", { name: "Object 1, middle frame" });
  await expect(preview).toBeVisible();
  await expect.poll(() => preview.evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth)).toBe(320);
  await expect(page.getByText("The machine marked text as burned into these images.")).toBeVisible();
  await shot(page, testInfo, "received-studies");

  // Claim the unassigned study; it is now the clinician's.
  await unassigned.getByRole("button", { name: /^Claim the study/ }).click();
  await expect(rows.filter({ hasText: "Claimed by you" })).toHaveCount(1);

  // Make an exam of the matched study in one step.
  await matched.getByRole("link", { name: "Make exam" }).click();
  await expect(page.getByRole("heading", { level: 1, name: "Make an exam of a received study" })).toBeVisible();
  const main = page.getByRole("main");
  await main.getByLabel("Application").selectOption({ label: "Focused cardiac" });
  await main.getByRole("radio", { name: "Educational" }).check();
  await main.getByLabel("Transducer").selectOption("phased");
  await main.getByLabel("Indication").fill("Teaching scan on a volunteer");
  const findings = main.getByRole("group").filter({ has: page.getByRole("radio", { name: "Indeterminate" }) });
  for (let i = 0; i < (await findings.count()); i++) await findings.nth(i).getByRole("radio", { name: "Negative" }).check();
  await main.getByRole("button", { name: "Make draft exam with 1 clip" }).click();
  await expect(page).toHaveURL(/\/exams\/[0-9a-f-]{36}\/edit$/);
  await expect(page.getByText("Draft made from the received study: 1 clip is being processed.")).toBeVisible();
  const clip = page.getByRole("listitem", { name: "Clip received-1.dcm" });
  await expect(clip.getByText("Ready", { exact: true })).toBeVisible({ timeout: 45_000 });
  await expect(clip).toContainText("DICOM · 8 cm · 5 MHz · 10 frames");

  // A DICOM file without an extension, dropped on the same draft, is known by its content.
  const bare = path.join(dir, "EXPORT0001");
  fs.writeFileSync(bare, usMultiframe({ studyUid: demoUid(), frames: 3, seed: 5 }));
  await page.getByLabel("Choose files").setInputFiles(bare);
  const dropped = page.getByRole("listitem", { name: "Clip EXPORT0001" });
  await expect(dropped.getByText("Ready", { exact: true })).toBeVisible({ timeout: 45_000 });
  await expect(dropped).toContainText("DICOM · 8 cm · 5 MHz · 3 frames");
  await shot(page, testInfo, "exam-from-received-study");

  // The made study has left the received studies.
  await page.goto("/received");
  await expect(page.getByRole("row").filter({ hasText: `US_${tag}` })).toHaveCount(1);
  fs.rmSync(dir, { recursive: true, force: true });
});
