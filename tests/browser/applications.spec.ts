// Setup → Applications with forms, not JSON: an admin of the second demo program edits the
// ocular application, is stopped with the error beside the field (a finding without a label,
// a depth range upside down), saves version 2, and sees version 1 kept in the history. The
// second program keeps this spec apart from the ones that use the first program's catalogue.
import { expect, test } from "@playwright/test";
import { PASSWORD, shot } from "./support";

test("an admin edits an application through the form and publishes its next version", async ({ page }, testInfo) => {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill("admin@tamsinridge.example");
  await page.getByLabel("Password").fill(PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page).toHaveURL(/\/$/);

  await page.goto("/setup/applications");
  const main = page.getByRole("main");
  const card = main.getByRole("article", { name: "Ocular" });
  await expect(card.getByText("version 1")).toBeVisible();
  await expect(card.getByText("Do not press on a possibly open globe", { exact: false })).toBeVisible();
  await card.getByRole("link", { name: "Edit Ocular" }).click();
  await expect(main.getByRole("heading", { level: 1, name: "Ocular, version 1" })).toBeVisible();

  // A finding without a label and an upside-down depth range are refused beside their fields.
  const firstFinding = main.getByRole("listitem").filter({ has: page.getByRole("heading", { name: /^Finding 1/ }) });
  await firstFinding.getByLabel("Label").fill("");
  await main.getByLabel("Typical depth from (cm)").fill("6");
  await main.getByRole("button", { name: "Save as version 2" }).click();
  await expect(firstFinding.getByText("Give the finding a label")).toBeVisible();
  await expect(main.getByText("The shallowest typical depth is deeper than the deepest: swap them")).toBeVisible();
  await expect(main.getByLabel("Typical depth from (cm)")).toHaveAttribute("aria-invalid", "true");

  // Corrected, relabelled, a finding added (its key made from its label), and saved.
  await main.getByLabel("Typical depth from (cm)").fill("3");
  await firstFinding.getByLabel("Label").fill("Retinal detachment (tethered at the disc)");
  await main.getByRole("button", { name: "Add finding" }).click();
  const added = main.getByRole("listitem").filter({ has: page.getByRole("heading", { name: /^Finding 6/ }) });
  await added.getByLabel("Label").fill("Globe rupture");
  await added.getByLabel("Hint").click();
  await expect(added.getByLabel("Key")).toHaveValue("globe_rupture");
  await main.getByRole("button", { name: "Save as version 2" }).click();

  await expect(main.getByRole("heading", { level: 1, name: "Ocular, version 2" })).toBeVisible();
  await expect(main.getByText("Saved as version 2, now in use. Version 1 is archived; exams recorded under it keep it.")).toBeVisible();
  const versions = main.getByRole("region", { name: "Versions" });
  await expect(versions.getByRole("listitem")).toHaveCount(2);
  await expect(versions.getByRole("listitem").nth(1)).toContainText("Archived");
  await shot(page, testInfo, "application-editor-version-2");

  // Version 1 opens read-only with its own labels.
  await versions.getByRole("link", { name: "Version 1" }).click();
  await expect(main.getByRole("heading", { level: 1, name: "Ocular, version 1" })).toBeVisible();
  await expect(main.getByText("This version is archived and cannot change.", { exact: false })).toBeVisible();
  await expect(
    main
      .getByRole("listitem")
      .filter({ has: page.getByRole("heading", { name: /^Finding 1/ }) })
      .getByLabel("Label"),
  ).toHaveValue("Retinal detachment");
  await expect(main.getByRole("button", { name: /Save as version/ })).toHaveCount(0);

  await page.goto("/setup/applications");
  const after = main.getByRole("article", { name: "Ocular" });
  await expect(after.getByText("version 2")).toBeVisible();
  await expect(after.getByText("Globe rupture")).toBeVisible();
});
