import { describe, expect, it } from "vitest";
import type { Page } from "playwright-core";
import { baseUrl, signIn } from "../helpers/browser";
import { e2eBrowserAndDatabase } from "../helpers/e2e-file";
import { oneTimeLink, waitForMailTo } from "../helpers/captured-mail";
import { insertThrowawayGrower } from "../helpers/throwaway-account";
import { DEMO_PASSWORDS, DEMO_SITES, DEMO_STAFF, DEMO_TRIALS } from "@/db/demo-data";

// A reader who asks for Spanish (?lang=es) gets the whole public trial, variety and site page in Spanish, not
// just their frame; sign-in, reset and invitation pages follow the same address, and the mails Seedplot sends
// a Spanish reader are Spanish with links that open Spanish pages.

const { e2e, openPage } = e2eBrowserAndDatabase();
const TRIAL = DEMO_TRIALS.find((t) => t.publishedAtSeed)!;

/** English sentences and headings the public pages used to show under ?lang=es; none of them may remain. */
const ENGLISH = [
  "Summary for growers",
  "did not differ clearly",
  "came first",
  "treat any order as a tie",
  "Means across",
  "Listed highest first",
  "Listed earliest first",
  "LSD 0.05",
  "Difference from check",
  "% of check",
  "Rank",
  "Better when",
  "Higher is better",
  "not ranked",
  "Variety by site",
  "Results from",
  "The same data as open JSON",
  "days from sowing",
  "Seeds sown",
  "Chi-square",
  "Compared with the seed label",
  "Region",
  "Growing setup",
  "Published trials grown here",
  "One site and one season",
  "Results in",
  "season by season",
  "All seasons together",
  "grown as the check variety",
  "Varieties sharing a group letter",
  "How a season works",
  "See the results",
];

/** The words a reader sees (the page's text, not its markup), with variety, site and trial names, which stay as typed, taken out. */
async function visibleText(page: Page, names: string[]) {
  let text = await page.locator("main").innerText();
  for (const name of names.filter(Boolean).sort((a, b) => b.length - a.length)) text = text.split(name).join(" ");
  return text;
}

const englishIn = (text: string) => ENGLISH.filter((phrase) => text.includes(phrase));

async function namesOnTrialPage(page: Page) {
  const links = await page.locator("main a[href*='/varieties/'], main a[href*='/sites/']").allInnerTexts();
  return [TRIAL.title, ...links];
}

describe("public pages in Spanish", () => {
  it("the public trial, variety and site pages under ?lang=es show none of the English sentences they used to, and their links keep ?lang=es", async () => {
    const { page, context } = await openPage();
    await page.goto(`/results/${TRIAL.code}?lang=es`);
    await page.getByRole("heading", { name: "Resumen para productores" }).waitFor();
    const names = await namesOnTrialPage(page);
    const trial = await visibleText(page, names);
    expect(englishIn(trial)).toEqual([]);
    expect(trial).toMatch(/Medias en los \d+ sitios\./);
    expect(trial).toContain("Puesto");
    expect(trial).toMatch(/\d,\d/); // Spanish figures: a decimal comma
    expect(trial).toMatch(/Resultados de \d+ de \d+ sitios\./);
    // The charts' axes number their ticks in Spanish too ("19,5", not "19.5").
    await page.locator("main figure svg text").first().waitFor({ state: "attached" });
    const ticks = (await page.locator("main figure svg text").allTextContents()).map((x) => x.trim()).filter((x) => /^[\d.,−-]+$/.test(x));
    expect(ticks.length).toBeGreaterThan(0);
    expect(ticks.filter((x) => /\d\.\d/.test(x))).toEqual([]);

    const variety = page.locator("main a[href*='/varieties/']").first();
    expect(await variety.getAttribute("href")).toMatch(/^\/varieties\/\d+\?lang=es$/);
    const site = page.locator("main a[href*='/sites/']").first();
    expect(await site.getAttribute("href")).toMatch(/^\/sites\/\d+\?lang=es$/);
    const siteHref = (await site.getAttribute("href"))!;

    await variety.click();
    await page.getByRole("heading", { name: "% del testigo, temporada por temporada" }).waitFor();
    expect(englishIn(await visibleText(page, [...names, await page.getByRole("heading", { level: 1 }).innerText()]))).toEqual([]);
    expect(await page.locator("main").innerText()).toContain("Mejor cuando");

    await page.goto(siteHref);
    await page.getByRole("heading", { name: "Ensayos publicados cultivados aquí" }).waitFor();
    expect(englishIn(await visibleText(page, [...names, await page.getByRole("heading", { level: 1 }).innerText()]))).toEqual([]);

    await page.goto("/?lang=es");
    await page.getByRole("heading", { name: "Cómo funciona una temporada" }).waitFor();
    expect(englishIn(await visibleText(page, names))).toEqual([]);

    await page.goto(`/results/NO-SUCH-TRIAL?lang=es`);
    await page.getByRole("heading", { name: "Página no encontrada" }).waitFor();
    await context.close();
  }, 120_000);

  it("without ?lang=es the same pages are English", async () => {
    const { page, context } = await openPage();
    await page.goto(`/results/${TRIAL.code}`);
    await page.getByRole("heading", { name: "Summary for growers" }).waitFor();
    const text = await page.locator("main").innerText();
    for (const phrase of ["% of check", "Rank", "Results from", "The same data as open JSON"]) expect(text, phrase).toContain(phrase);
    expect(text).not.toContain("Resumen para productores");
    await page.locator("main a[href*='/varieties/']").first().click();
    await page.getByRole("heading", { name: "% of check, season by season" }).waitFor();
    await context.close();
  }, 60_000);

  it("the public cache never answers a Spanish address with the English page or the other way round", async () => {
    const get = async (path: string) => {
      const res = await fetch(new URL(path, baseUrl));
      expect(res.status, path).toBe(200);
      return { cache: res.headers.get("x-public-cache"), body: await res.text() };
    };
    const spanish = `/results/${TRIAL.code}?lang=es`;
    const english = `/results/${TRIAL.code}`;
    // Each address asked twice, interleaved, so the second answer of each comes from the cache.
    const answers = [await get(spanish), await get(english), await get(spanish), await get(english)];
    expect(answers.slice(2).map((a) => a.cache)).toEqual(["hit", "hit"]);
    for (const [i, a] of answers.entries()) {
      const isSpanish = i % 2 === 0;
      expect(a.body.includes("Resumen para productores"), `answer ${i}`).toBe(isSpanish);
      expect(a.body.includes("Summary for growers"), `answer ${i}`).toBe(!isSpanish);
      expect(/<html[^>]*lang="es"/.test(a.body), `answer ${i}`).toBe(isSpanish);
      // the whole page, the summary included, in the address's language
      expect(/came first|did not differ clearly/.test(a.body), `answer ${i}`).toBe(!isSpanish);
      expect(/quedó en primer lugar|no difirieron claramente/.test(a.body), `answer ${i}`).toBe(isSpanish);
    }
  });
});

describe("sign-in, reset and invitation in Spanish", () => {
  it("a Spanish grower's reset mail is Spanish, its link carries lang=es and opens Spanish pages through to a Spanish sign-in", async () => {
    const { email } = await insertThrowawayGrower(e2e, "es-reset", "Lucía Prado");
    await e2e.pool.query("UPDATE users SET locale = 'es' WHERE email = ?", [email]);
    const { page, context } = await openPage();
    await page.goto("/forgot-password?lang=es");
    await page.getByLabel("Correo electrónico").fill(email);
    await page.getByRole("button", { name: "Enviar el enlace" }).click();
    await page.getByText("Si ese correo pertenece a una cuenta de Seedplot").waitFor();

    const [mail] = await waitForMailTo(email);
    expect(mail!.subject).toBe("Restablezca su contraseña de Seedplot");
    expect(mail!.text).toContain("Hola, Lucía Prado:");
    expect(mail!.text).toContain("Si usted no lo pidió, ignore este mensaje; su contraseña sigue siendo la misma.");
    expect(mail!.text).not.toMatch(/Reset your|Choose a new password|If you did not ask/);
    const link = oneTimeLink(mail!);
    expect(link).toMatch(/\/reset-password\/[A-Za-z0-9_-]+\?lang=es$/);

    await page.goto(link);
    await page.getByRole("heading", { name: "Elija una contraseña nueva" }).waitFor();
    expect(await page.locator("html").getAttribute("lang")).toBe("es");
    await page.getByLabel("Contraseña nueva", { exact: true }).fill("surcos-de-rabanito-2026");
    await page.getByLabel("Repita la contraseña nueva").fill("surcos-de-rabanito-2026");
    await page.getByRole("button", { name: "Guardar la contraseña nueva" }).click();
    await page.waitForURL(/\/sign-in\?reset=1&lang=es$/);
    await page.getByText("Su contraseña se cambió. Inicie sesión con la nueva.").waitFor();

    // A refused sign-in is answered in the page's language too.
    await page.getByLabel("Correo electrónico").fill(email);
    await page.getByLabel("Contraseña", { exact: true }).fill("not-the-new-password");
    await page.getByRole("button", { name: "Iniciar sesión" }).click();
    await page.getByText("Ese correo electrónico y esa contraseña no coinciden con ninguna cuenta.", { exact: false }).waitFor();

    // The spent link says so in Spanish.
    await page.goto(link);
    await page.getByRole("heading", { name: "Este enlace ya no sirve" }).waitFor();
    await context.close();
  }, 60_000);

  it("a coordinator invites a new grower in Spanish: the account keeps Spanish, the mail is Spanish and its link opens the Spanish invitation page", async () => {
    const email = `es-invite-${Date.now()}@example.org`;
    const staff = await openPage();
    await signIn(staff.page, DEMO_STAFF[1].email, DEMO_PASSWORDS.coordinator);
    await staff.page.goto("/portal/cooperators");
    await staff.page.getByLabel("Grower's name").fill("Tomás Rivera");
    await staff.page.getByLabel("E-mail").fill(email);
    await staff.page.getByLabel("Site", { exact: true }).selectOption({ label: DEMO_SITES[3].name });
    await staff.page.getByLabel("Language of the invitation").selectOption("es");
    await staff.page.getByRole("button", { name: "Send invitation" }).click();
    await staff.page.getByText(`Invitation sent to ${email}.`).waitFor();
    await staff.context.close();

    const [[account]] = (await e2e.pool.query("SELECT locale FROM users WHERE email = ?", [email])) as unknown as [{ locale: string }[]];
    expect(account!.locale).toBe("es");
    const [mail] = await waitForMailTo(email);
    expect(mail!.subject).toBe("Le invitamos a registrar datos de ensayos de variedades en Seedplot");
    expect(mail!.text).toContain(`le invitó a Seedplot para ${DEMO_SITES[3].name}`);
    expect(mail!.text).toContain("Si no esperaba este mensaje, puede ignorarlo.");
    expect(mail!.text).not.toMatch(/You're invited|has invited you|If you were not expecting/);
    const link = oneTimeLink(mail!);
    expect(link).toMatch(/\/invite\/[A-Za-z0-9_-]+\?lang=es$/);

    const grower = await openPage({ width: 390, height: 844 });
    await grower.page.goto(link);
    await grower.page.getByRole("heading", { name: "Bienvenido a Seedplot" }).waitFor();
    expect(await grower.page.getByLabel("Elija una contraseña").count()).toBe(1);
    expect(await grower.page.locator("main").innerText()).not.toMatch(/Set a password|Choose a password|Welcome to Seedplot/);
    await grower.context.close();
  }, 60_000);
});
