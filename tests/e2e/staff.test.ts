// The admin invites a coordinator from the users page; she accepts through the mailed link on her phone and
// lands in the portal signed in, running only the program she was given. Later the admin deactivates her
// (after a confirmation) and her sign-in says so, while a wrong password gets the usual answer.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { launchBrowser, newPage, signIn } from "../helpers/browser";
import { DEMO_PASSWORDS, DEMO_SECOND_PROGRAM, DEMO_STAFF } from "@/db/demo-data";
import { oneTimeLink, waitForMailTo } from "../helpers/captured-mail";
import { SIGN_IN_FAILED } from "@/lib/domain/sign-in-messages";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("the admin invites a coordinator, who accepts and lands signed in", () => {
  it("works end to end in the browser, the link read from the captured mail", async () => {
    const email = `new-coordinator-${Date.now()}@example.org`;
    const password = "juniper-greens-2027";
    const admin = await newPage(browser);
    await signIn(admin.page, DEMO_STAFF[0].email, DEMO_PASSWORDS.admin);
    await admin.page.goto("/portal/admin/users");
    await admin.page.getByRole("heading", { name: "Invite a coordinator or administrator" }).waitFor();

    // A coordinator without a program is refused, and the typed values stay.
    await admin.page.getByLabel("Name", { exact: true }).fill("Marta Lindqvist");
    await admin.page.getByLabel("E-mail", { exact: true }).fill(email);
    await admin.page.getByRole("button", { name: "Send invitation", exact: true }).click();
    await admin.page.getByText("Tick at least one program for the coordinator.").waitFor();
    expect(await admin.page.getByLabel("E-mail", { exact: true }).inputValue()).toBe(email);

    await admin.page.getByRole("checkbox", { name: DEMO_SECOND_PROGRAM.name }).check();
    await admin.page.getByRole("button", { name: "Send invitation", exact: true }).click();
    await admin.page.getByText(`Invitation sent to ${email} as coordinator. The link works for 7 days.`).waitFor();

    // The new person is listed with her role, program and a pending invitation, and search finds her by e-mail.
    await admin.page.getByLabel("Search by name or e-mail").fill(email);
    const row = admin.page.getByRole("row", { name: new RegExp(email.replace(/[.]/g, "\\.")) });
    await row.getByText("Invitation pending").waitFor();
    expect(await row.getByText(DEMO_SECOND_PROGRAM.name).count()).toBe(1);
    expect(await row.getByText("Never").count()).toBe(1);
    expect(await admin.page.getByRole("row").count()).toBe(2);

    const [mail] = await waitForMailTo(email);
    expect(mail!.subject).toBe("You're invited to Seedplot as coordinator");
    const link = oneTimeLink(mail!);

    const coordinator = await newPage(browser, { width: 390, height: 844 });
    await coordinator.page.goto(link);
    await coordinator.page.getByRole("heading", { name: "Welcome to Seedplot" }).waitFor();
    await coordinator.page.getByLabel("Choose a password").fill(password);
    await coordinator.page.getByLabel("Password again").fill(password);
    await coordinator.page.getByRole("button", { name: "Set password and continue" }).click();
    // Signed in straight away: the portal opens, not an empty sign-in form.
    await coordinator.page.waitForURL("**/portal");
    await coordinator.page.getByRole("heading", { name: "Program overview" }).waitFor();
    expect(await coordinator.page.getByText("Marta Lindqvist · Coordinator").count()).toBe(1);
    expect(await coordinator.page.getByText(DEMO_SECOND_PROGRAM.trial.code).count()).toBe(1);
    // She runs the program she was given, and only that one.
    await coordinator.page.goto("/portal/seasons");
    await coordinator.page.getByRole("heading", { name: "Seasons" }).waitFor();
    expect(await coordinator.page.getByText("Autumn 2027").count()).toBeGreaterThan(0);
    expect(await coordinator.page.getByText("Spring 2026").count()).toBe(0);

    // The spent link says it was used.
    await coordinator.page.goto(link);
    expect(await coordinator.page.getByRole("heading", { name: "This invitation was already used" }).count()).toBe(1);
    await coordinator.context.close();

    // The admin sees the invitation used and a last sign-in; deactivating asks first.
    await admin.page.reload();
    await admin.page.getByLabel("Search by name or e-mail").fill(email);
    await row.getByText("Invitation used").waitFor();
    expect(await row.getByText("Never").count()).toBe(0);
    await row.getByRole("button", { name: "Deactivate" }).click();
    const dialog = admin.page.getByRole("dialog", { name: "Deactivate Marta Lindqvist?" });
    await dialog.getByRole("button", { name: "Keep as it is" }).click();
    await dialog.waitFor({ state: "detached" });
    expect(await row.getByText("Deactivated").count()).toBe(0);
    await row.getByRole("button", { name: "Deactivate" }).click();
    await dialog.getByRole("button", { name: "Deactivate account" }).click();
    await admin.page.getByText("Account deactivated.").waitFor();
    await row.getByText("Deactivated").waitFor();
    await admin.context.close();

    const again = await newPage(browser, { width: 390, height: 844 });
    await again.page.goto("/sign-in");
    await again.page.getByLabel("E-mail").fill(email);
    await again.page.getByLabel("Password").fill("not-her-password");
    await again.page.getByRole("button", { name: "Sign in" }).click();
    await again.page.getByText(SIGN_IN_FAILED).waitFor();
    await again.page.getByLabel("Password").fill(password);
    await again.page.getByRole("button", { name: "Sign in" }).click();
    await again.page.getByText(`This account has been deactivated, so it cannot sign in. Ask ${DEMO_STAFF[0].name} (${DEMO_STAFF[0].email}) to reactivate it if you still need it.`).waitFor();
    expect(again.page.url()).toMatch(/\/sign-in$/);
    await again.context.close();
  }, 90_000);
});
