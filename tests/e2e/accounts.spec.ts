import { expect, test, type Page } from "@playwright/test";
import { Mailbox } from "./pages/mailbox";
import { DEMO_PASSWORD, Shell, SignInPage } from "./pages/sign-in-page";

const ROLES = [
  { email: "admin@example.org", name: "Dana Whitlock", nav: ["Overview", "Register", "Inventory", "Locations", "Temperatures", "Substances", "Exports", "Admin"] },
  { email: "safety@example.org", name: "Priya Halden", nav: ["Overview", "Register", "Inventory", "Locations", "Temperatures", "Substances", "Exports"] },
  { email: "researcher@example.org", name: "Jonas Ekberg", nav: ["Overview", "Register", "Inventory", "Locations", "Substances"] },
  { email: "facilities@example.org", name: "Mireille Okafor", nav: ["Overview", "Register", "Inventory", "Locations", "Temperatures", "Substances"] },
  { email: "auditor@example.org", name: "Samuel Brandt", nav: ["Overview", "Register", "Inventory", "Locations", "Temperatures", "Substances", "Exports"] },
];

test("each demo role signs in, sees its navigation and real counts, and is kept out of other areas", async ({ page }) => {
  const signIn = new SignInPage(page);
  const shell = new Shell(page);

  await signIn.goto();
  await signIn.signIn("admin@example.org", "wrong password");
  await signIn.expectError("That e-mail address and password do not match an active account.");
  await expect(page.getByLabel("E-mail address")).toHaveValue("admin@example.org");

  for (const role of ROLES) {
    await signIn.goto();
    await signIn.signIn(role.email, DEMO_PASSWORD);
    await expect(page).toHaveURL(/\/$/);
    await expect(page.getByRole("heading", { level: 1 })).toContainText(role.name.split(" ")[0]);
    expect(await shell.navLabels()).toEqual(role.nav);
    // The overview counts come from the demo database: 2 sites, 7 rooms, 17 storage units.
    const keeps = page.getByRole("region", { name: "What Headroom keeps" }).or(page.locator("section", { hasText: "What Headroom keeps" }));
    await expect(keeps.getByText("Storage units").locator("..")).toContainText("17");
    if (!role.nav.includes("Admin")) {
      await page.goto("/admin");
      await expect(page.getByRole("heading", { name: "Your role does not open this page" })).toBeVisible();
      await expect(page.getByText("Invite a person")).toHaveCount(0);
      await page.goto("/");
    }
    await shell.signOut();
  }

  const anonymous = await page.goto("/locations");
  expect(anonymous?.url()).toMatch(/\/sign-in$/);
});

test("an administrator invites a person, who follows the e-mailed link, sets a password and is signed in", async ({ page, request }) => {
  const signIn = new SignInPage(page);
  const mailbox = new Mailbox(request);
  const address = `new.colleague.${Date.now()}@example.org`;

  await signIn.goto();
  await signIn.signIn("admin@example.org", DEMO_PASSWORD);
  await page.getByRole("navigation", { name: "Main" }).first().getByRole("link", { name: "Admin" }).click();
  await expect(page.getByRole("heading", { name: "Administration" })).toBeVisible();

  const invite = page.locator("form#invite-user");
  await invite.getByRole("button", { name: "Send invitation" }).click();
  await expect(invite.getByText("Enter the person's name.")).toBeVisible();
  await invite.getByLabel("Name").fill("Noor Castellan");
  await invite.getByLabel("E-mail address").fill(address);
  await invite.getByLabel("Role").selectOption("researcher");
  await invite.getByRole("button", { name: "Send invitation" }).click();
  await expect(invite.getByRole("status")).toContainText(`Invitation sent to ${address}`);
  await expect(page.getByRole("row", { name: /Noor Castellan/ })).toContainText("Invited");
  await new Shell(page).signOut();

  const message = await mailbox.latestTo(address, "You are invited to Headroom");
  await page.goto(Mailbox.linkIn(message, "/invitation"));
  await expect(page.getByRole("heading", { name: "Activate your account" })).toBeVisible();
  await page.getByLabel("New password", { exact: true }).fill("short");
  await page.getByLabel("Repeat the new password").fill("short");
  await page.getByRole("button", { name: "Activate and sign in" }).click();
  await expect(page.getByText("Use at least 12 characters.")).toBeVisible();
  await page.getByLabel("New password", { exact: true }).fill("flasks on the top shelf");
  await page.getByLabel("Repeat the new password").fill("flasks on the top shelf");
  await page.getByRole("button", { name: "Activate and sign in" }).click();
  await expect(page).toHaveURL(/\/$/);
  await expect(page.getByRole("heading", { level: 1 })).toContainText("Noor");
  expect(await new Shell(page).navLabels()).toEqual(ROLES[2].nav);

  // The link worked once.
  await new Shell(page).signOut();
  await page.goto(Mailbox.linkIn(message, "/invitation"));
  await expect(page.getByRole("heading", { name: "This invitation no longer works" })).toBeVisible();
});

async function resetPasswordByEmail(page: Page, mailbox: Mailbox, email: string, password: string, typo?: string) {
  await page.goto("/reset-password");
  await page.getByLabel("E-mail address").fill(email);
  await page.getByRole("button", { name: "Send reset link" }).click();
  await expect(page.getByRole("status")).toContainText("If an account exists for that address");
  const message = await mailbox.latestTo(email, "Reset your Headroom password");
  await page.goto(Mailbox.linkIn(message, "/reset-password"));
  await expect(page.getByRole("heading", { name: "Choose a new password" })).toBeVisible();
  await page.getByLabel("New password", { exact: true }).fill(password);
  if (typo) {
    await page.getByLabel("Repeat the new password").fill(typo);
    await page.getByRole("button", { name: "Save new password" }).click();
    await expect(page.getByText("The two passwords differ.")).toBeVisible();
  }
  await page.getByLabel("Repeat the new password").fill(password);
  await page.getByRole("button", { name: "Save new password" }).click();
  await expect(page).toHaveURL(/\/sign-in\?reset=1/);
  await expect(page.getByText("Your password was changed.")).toBeVisible();
}

test("a person resets a forgotten password through the e-mailed link and signs in with the new one", async ({ page, request }) => {
  const signIn = new SignInPage(page);
  const mailbox = new Mailbox(request);

  await signIn.goto();
  await page.getByRole("link", { name: "Forgot your password?" }).click();
  await expect(page.getByRole("heading", { name: "Reset your password" })).toBeVisible();
  await resetPasswordByEmail(page, mailbox, "auditor@example.org", "audits every quarter", "audits every quartre");

  await signIn.signIn("auditor@example.org", DEMO_PASSWORD);
  await signIn.expectError("do not match");
  await signIn.signIn("auditor@example.org", "audits every quarter");
  await expect(page).toHaveURL(/\/$/);
  await expect(page.getByRole("heading", { level: 1 })).toContainText("Samuel");

  // Put the demo account back as it was, through the same link (the other journeys sign in with it).
  await new Shell(page).signOut();
  await resetPasswordByEmail(page, mailbox, "auditor@example.org", DEMO_PASSWORD);
});
