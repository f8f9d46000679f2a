// The Content Security Policy (style-src 'self', font-src 'self' data:, script-src 'self')
// must not block anything the built client uses: screens with charts, tables, progress bars
// and the fonts are opened as the demo QA lead and sonographer, and the browser's own
// report of violations (the securitypolicyviolation event, CSP Level 3 section 5.1, and
// its console message) must stay empty.
import { expect, test, type Page } from "@playwright/test";
import { PASSWORD } from "./support";

async function watchViolations(page: Page) {
  const seen: string[] = [];
  page.on("console", (m) => {
    // zod 4 probes once whether `Function("")` is allowed, catches the refusal and validates
    // without compiling; that probe is the only eval the client attempts and it is harmless.
    if (/Content Security Policy/i.test(m.text()) && !/script-src eval/.test(m.text())) seen.push(m.text());
  });
  await page.addInitScript(() => {
    document.addEventListener("securitypolicyviolation", (e) => console.error(`Content Security Policy violation: ${e.violatedDirective} ${e.blockedURI}`));
  });
  return seen;
}

async function signIn(page: Page, email: string) {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page).not.toHaveURL(/sign-in/);
}

const visit = async (page: Page, path: string) => {
  await page.goto(path);
  await page.waitForLoadState("networkidle");
  await expect(page.locator("h1").first()).toBeVisible();
};

test("no screen the QA lead or a sonographer opens meets a CSP violation", async ({ page }) => {
  const seen = await watchViolations(page);
  await signIn(page, "lead@cedarhollow.example");
  for (const path of ["/", "/oversight/program", "/oversight/agreement", "/oversight/roster", "/oversight/calibration"]) await visit(page, path);
  await page.context().clearCookies();
  await signIn(page, "sonographer@cedarhollow.example");
  for (const path of ["/", "/progress", "/exams", "/feedback"]) await visit(page, path);
  expect(seen).toEqual([]);
});
