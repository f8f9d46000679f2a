// Signing in as each demo role lands on a home page made for that role: its own sections,
// only the navigation it may use, a screenshot for review; plus wrong-password and sign-out.
import path from "node:path";
import { expect, test, type Page } from "@playwright/test";

const PASSWORD = "soundings-demo";
const PROGRAM = "Cedar Hollow Emergency Medicine";

type DemoRole = {
  role: "sonographer" | "reviewer" | "qa_lead" | "admin";
  email: string;
  roleLabel: string;
  seesPeople: boolean;
  seesAudit: boolean;
};

const DEMO: DemoRole[] = [
  { role: "sonographer", email: "sonographer@cedarhollow.example", roleLabel: "Clinician", seesPeople: false, seesAudit: false },
  { role: "reviewer", email: "reviewer@cedarhollow.example", roleLabel: "Reviewer", seesPeople: false, seesAudit: false },
  { role: "qa_lead", email: "lead@cedarhollow.example", roleLabel: "QA lead", seesPeople: true, seesAudit: false },
  { role: "admin", email: "admin@cedarhollow.example", roleLabel: "Administrator", seesPeople: true, seesAudit: true },
];

async function signIn(page: Page, email: string, password = PASSWORD) {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
}

for (const demo of DEMO) {
  test(`${demo.role} signs in and sees their own home page`, async ({ page }, testInfo) => {
    await signIn(page, demo.email);
    await expect(page).toHaveURL(/\/$/);
    const main = page.getByRole("main");
    await expect(main.getByRole("heading", { level: 1, name: "Home" })).toBeVisible();
    await expect(main.getByText(`What needs you now in ${PROGRAM}.`)).toBeVisible();
    // The section for the demo role is there, labelled with the role.
    await expect(main.getByText(demo.roleLabel, { exact: true })).toBeVisible();

    const nav = page.getByRole("navigation", { name: "Main" });
    await expect(nav.getByRole("link", { name: "Home" })).toBeVisible();
    await expect(nav.getByRole("link", { name: "People" })).toHaveCount(demo.seesPeople ? 1 : 0);
    await expect(nav.getByRole("link", { name: "Audit log" })).toHaveCount(demo.seesAudit ? 1 : 0);

    if (demo.role === "reviewer") {
      // The reviewer's counts lead to the queue.
      await expect(main.getByRole("link", { name: /Exams waiting for a read/ })).toHaveAttribute("href", "/queue");
      await expect(main.getByRole("link", { name: /Exams you hold/ })).toHaveAttribute("href", "/queue");
    } else if (demo.role === "sonographer") {
      // The sonographer's counts lead to My exams, already filtered (other tests may have added exams).
      const drafts = main.getByRole("link", { name: /Drafts not yet submitted/ });
      await expect(drafts).toHaveAttribute("href", "/exams?status=draft");
      await expect(main.getByRole("link", { name: /Submitted, waiting for review/ })).toHaveAttribute("href", "/exams?status=submitted");
    } else {
      // Real counts link to where the work is.
      const firstCard = main.getByRole("list").first().getByRole("link").first();
      await expect(firstCard).toBeVisible();
      await expect(firstCard).toHaveText(/\d/);
    }

    // The account panel names the person's program and roles.
    await page.getByRole("button", { name: /^Account:/ }).click();
    await expect(page.getByText(PROGRAM, { exact: true }).last()).toBeVisible();

    // The clinical caution is on every screen.
    await expect(page.getByRole("contentinfo")).toContainText("It does not make diagnoses");

    await page.keyboard.press("Escape");
    const file = path.join(testInfo.project.outputDir, `home-${demo.role}.png`);
    await page.screenshot({ path: file, fullPage: true });
    await testInfo.attach(`home-${demo.role}`, { path: file, contentType: "image/png" });
  });
}

test("a wrong password is refused with a message next to the form", async ({ page }) => {
  await signIn(page, "admin@cedarhollow.example", "not-the-password");
  await expect(page.getByRole("alert")).toContainText("E-mail or password is incorrect");
  await expect(page).toHaveURL(/\/sign-in/);
  await expect(page.getByRole("heading", { level: 1, name: "Sign in" })).toBeVisible();
});

test("empty fields are named next to the fields", async ({ page }) => {
  await page.goto("/sign-in");
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page.getByText("Enter an e-mail address")).toBeVisible();
  await expect(page.getByText("Enter your password")).toBeVisible();
  await expect(page.getByLabel("E-mail")).toBeFocused();
});

test("signing out returns to the sign-in page and protected pages ask to sign in again", async ({ page }) => {
  await signIn(page, "sonographer@cedarhollow.example");
  await expect(page.getByRole("heading", { level: 1, name: "Home" })).toBeVisible();
  await page.getByRole("button", { name: /^Account:/ }).click();
  await page.getByRole("button", { name: "Sign out" }).click();
  await expect(page).toHaveURL(/\/sign-in$/);
  await expect(page.getByRole("heading", { level: 1, name: "Sign in" })).toBeVisible();

  await page.goto("/setup/applications");
  await expect(page).toHaveURL(/\/sign-in\?next=%2Fsetup%2Fapplications/);
});

test("after signing in, a person returns to the page they asked for", async ({ page }) => {
  await page.goto("/setup/people");
  await expect(page).toHaveURL(/\/sign-in\?next=/);
  await page.getByLabel("E-mail").fill("admin@cedarhollow.example");
  await page.getByLabel("Password").fill(PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page.getByRole("heading", { level: 1, name: "People" })).toBeVisible();
  await expect(page.getByRole("table")).toContainText("admin@cedarhollow.example");
});

test("an unknown address shows the not-found page inside the app", async ({ page }) => {
  await signIn(page, "reviewer@cedarhollow.example");
  await expect(page.getByRole("heading", { level: 1, name: "Home" })).toBeVisible();
  await page.goto("/no-such-screen");
  await expect(page.getByRole("heading", { level: 1, name: "Page not found" })).toBeVisible();
});

test("when the home counts cannot be loaded, the page says so and offers a retry", async ({ page }) => {
  let failing = true;
  await page.route("**/api/home", (route) =>
    failing ? route.fulfill({ status: 500, json: { error: { code: "internal", message: "The server had a problem." } } }) : route.continue(),
  );
  await signIn(page, "lead@cedarhollow.example");
  // Server errors are retried quietly a couple of times before the page gives up.
  await expect(page.getByRole("alert")).toContainText("This could not be loaded", { timeout: 15_000 });
  failing = false;
  await page.getByRole("button", { name: "Try again" }).click();
  await expect(page.getByText("QA lead", { exact: true })).toBeVisible();
});

test("a QA lead who opens the audit log is told it is not theirs", async ({ page }) => {
  await signIn(page, "lead@cedarhollow.example");
  await expect(page.getByRole("heading", { level: 1, name: "Home" })).toBeVisible();
  await page.goto("/setup/audit");
  await expect(page.getByRole("heading", { level: 1, name: "No access" })).toBeVisible();
});

test("the first Tab offers a skip link to the content", async ({ page }) => {
  await signIn(page, "reviewer@cedarhollow.example");
  await expect(page.getByRole("heading", { level: 1, name: "Home" })).toBeVisible();
  // A fresh load puts the focus start at the top of the document; after the sign-in form it
  // may sit wherever the last click left it.
  await page.reload();
  await expect(page.getByRole("heading", { level: 1, name: "Home" })).toBeVisible();
  await page.keyboard.press("Tab");
  const skip = page.getByRole("link", { name: "Skip to content" });
  await expect(skip).toBeFocused();
  await expect(skip).toBeVisible();
  await page.keyboard.press("Enter");
  await expect(page.getByRole("main")).toBeFocused();
});

test("each screen names the browser tab", async ({ page }) => {
  await page.goto("/sign-in");
  await expect(page).toHaveTitle("Sign in · Soundings");
  await signIn(page, "admin@cedarhollow.example");
  await expect(page).toHaveTitle("Home · Soundings");
  await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Audit log" }).click();
  await expect(page).toHaveTitle("Audit log · Soundings");
  await expect(page.getByRole("heading", { level: 1, name: "Audit log" })).toBeFocused();
});
