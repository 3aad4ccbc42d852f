import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { execFileSync } from "node:child_process";
import { mkdirSync, writeFileSync } from "node:fs";
import path from "node:path";
import ExcelJS from "exceljs";
import { launchBrowser, newPage, signIn } from "../helpers/browser";
import { waitForMailTo } from "../helpers/captured-mail";
import { createDatabase } from "@/db/client";

// Mei Lin Harrow of Cedar Hollow Market Garden reads Spanish first. She sets her language on her account page
// and walks a day of recording on her phone, an upload with mistakes and a data set her coordinator
// returns; her e-mail and her printed sheets are in Spanish too. Screens and PDFs are kept for a reader.

const GROWER = "mei@cedarhollow.example";
const PASSWORD = "seedplot-grower-demo";
const SITE = "Cedar Hollow Market Garden";
const PHONE = { width: 390, height: 844 };
const shots = path.resolve("tests/output/spanish");
const e2e = createDatabase(process.env.E2E_DATABASE_URL!, 2);
let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
  mkdirSync(shots, { recursive: true });
});
afterAll(async () => {
  await browser?.close();
  // Other files read Mei's pages in English and the site's sheets in the reader's language.
  await e2e.pool.query("UPDATE users SET locale = 'en' WHERE email = ?", [GROWER]);
  await e2e.pool.query("UPDATE sites SET print_locale = NULL WHERE name = ?", [SITE]);
  await e2e.pool.end();
});

const pdfText = (pdf: Buffer, name: string) => {
  const file = path.join(shots, `${name}.pdf`);
  writeFileSync(file, pdf);
  // A page image to read as a grower would (pdftoppm), beside the text the assertions use.
  execFileSync("pdftoppm", ["-png", "-r", "60", "-f", "1", "-l", "1", file, path.join(shots, name)]);
  return execFileSync("pdftotext", ["-layout", file, "-"]).toString();
};

async function openSite(page: Page) {
  await page.goto("/portal/record");
  await page.getByRole("heading", { name: "Registrar datos" }).waitFor();
  await page.getByRole("link", { name: new RegExp(`${SITE}.*Baby-leaf kale`) }).click();
  await page.getByRole("heading", { name: new RegExp(`${SITE}: Baby-leaf kale`) }).waitFor();
}

describe("a grower whose language is Spanish", () => {
  it("sets Spanish on her account, records a day's counts, uploads a sheet with mistakes, and gets her data back with comments, all in Spanish", async () => {
    const { page, context } = await newPage(browser, PHONE);
    await signIn(page, GROWER, PASSWORD);

    // Her own account page: only her language, nobody else's.
    await page.goto("/portal/account");
    await page.getByLabel("Language of screens, e-mails and printouts").selectOption("es");
    await page.getByRole("button", { name: "Save language" }).click();
    await page.getByText("Idioma guardado.").waitFor();
    await page.goto("/portal");
    await page.getByRole("heading", { name: /^Hola, Mei/ }).waitFor();
    expect(await page.locator("html").getAttribute("lang")).toBe("es");
    const home = await page.locator("main").innerText();
    expect(home).toContain("Qué registrar ahora");
    expect(home).toMatch(/sembrado el \d{1,2} [a-z]{3,4}\.? 20\d\d · \d+ parcelas/);
    expect(home).toMatch(/\d+ de \d+ valores registrados/);
    expect(home).not.toMatch(/What to record next|values recorded|Seeds sown/);
    await page.screenshot({ path: path.join(shots, "phone-home-es.png"), fullPage: true });

    // A day of recording on the phone.
    await openSite(page);
    await page.getByRole("heading", { name: "Qué toca registrar" }).waitFor();
    expect(await page.locator("main").innerText()).toMatch(/Plántulas emergidas \(conteo\), día \d+ \(era para el .+\): faltan \d+ de \d+ parcelas/);
    const column = page.getByLabel("¿Qué va a registrar?");
    expect(await column.inputValue()).toMatch(/^emergence_count@\d+$/);
    const inputs = page.locator("[data-entry-input]");
    await inputs.first().waitFor();
    const values = ["5", "4", "6"];
    for (let i = 0; i < values.length; i += 1) {
      await inputs.nth(i).fill(values[i]!);
      await inputs.nth(i).press("Enter");
    }
    for (let i = 0; i < values.length; i += 1) {
      const state = page.locator(`#${await inputs.nth(i).getAttribute("id")}-state`);
      await expect.poll(() => state.textContent(), { timeout: 15_000 }).toBe("Guardado");
    }
    // A word where a count belongs is refused on the phone, in Spanish.
    await inputs.nth(3).fill("doce");
    await inputs.nth(3).press("Enter");
    const state3 = page.locator(`#${await inputs.nth(3).getAttribute("id")}-state`);
    await expect.poll(() => state3.textContent()).toBe("«doce» no es un número. Escriba solo cifras, por ejemplo 12 o 12.5.");
    // More seedlings than seeds sown is refused by the server, in Spanish.
    await inputs.nth(3).fill("9");
    await inputs.nth(3).press("Enter");
    await expect.poll(() => state3.textContent(), { timeout: 15_000 }).toMatch(/^9 plántulas emergidas son más que las 6 semillas sembradas en esta parcela/);
    await inputs.nth(3).fill("");
    await inputs.nth(3).press("Enter");
    // A plot without a value says why, with the reasons in Spanish.
    const id4 = await inputs.nth(4).getAttribute("id");
    const plot4 = page.locator("li", { has: page.locator(`#${id4}`) });
    await plot4.getByRole("button", { name: /^¿Sin valor\? .+: indique por qué$/ }).click();
    await plot4.getByLabel(/Sin valor porque/).selectOption({ label: "Comido o dañado por animales" });
    await expect.poll(() => page.locator(`#${id4}-state`).textContent(), { timeout: 15_000 }).toBe("Guardado");
    await page.getByText("Los valores se guardan a medida que escribe.").waitFor();
    await page.screenshot({ path: path.join(shots, "phone-record-es.png"), fullPage: false });

    // Without a signal, what waits on the phone is said in Spanish too, and goes out when the signal is back.
    await context.setOffline(true);
    await inputs.nth(3).fill("5");
    await inputs.nth(3).press("Enter");
    await page.getByText("Sin señal. 1 valor espera en este teléfono y se envía solo cuando vuelva la señal.").waitFor();
    await expect.poll(() => state3.textContent()).toMatch(/^Esperando en este teléfono · (Aún no hay nada guardado en Seedplot|Guardado en Seedplot: .+)$/);
    await inputs.nth(3).scrollIntoViewIfNeeded();
    await page.screenshot({ path: path.join(shots, "phone-record-waiting-es.png"), fullPage: false });
    await context.setOffline(false);
    await expect.poll(() => state3.textContent(), { timeout: 30_000 }).toBe("Guardado");
    await page.getByText("Los valores se guardan a medida que escribe.").waitFor();

    // An upload with mistakes: messages in Spanish, each with its row and column; nothing saved.
    const templateHref = await page.getByRole("link", { name: "Descargar hoja de cálculo (.xlsx)" }).getAttribute("href");
    const workbook = new ExcelJS.Workbook();
    await workbook.xlsx.load((await (await page.request.get(templateHref!)).body()) as unknown as ArrayBuffer);
    const dictionary = workbook.getWorksheet("Diccionario de datos");
    expect(dictionary, "the data dictionary is in Spanish").toBeTruthy();
    const dictText = JSON.stringify(dictionary!.getSheetValues());
    expect(dictText).toContain("Semillas sembradas");
    expect(dictText).toContain("Código ciego de la variedad");
    const plots = workbook.getWorksheet("Plots")!;
    const header = (plots.getRow(1).values as unknown[]).slice(1).map(String);
    const quality = header.indexOf("Overall quality [1-9]") + 1;
    const letter = String.fromCharCode(64 + quality);
    plots.getCell(2, quality).value = 6;
    plots.getCell(3, quality).value = "doce";
    plots.getCell(4, quality).value = 12;
    await page.getByRole("link", { name: "Subir una hoja completada" }).click();
    await page.getByRole("heading", { name: "Subir una hoja completada" }).waitFor();
    await page.getByLabel(/Hoja de cálculo \(\.xlsx o \.csv/).setInputFiles({ name: "cedar-hollow.xlsx", mimeType: "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet", buffer: Buffer.from(await workbook.xlsx.writeBuffer()) });
    await page.getByRole("button", { name: "Revisar el archivo" }).click();
    const problems = page.getByRole("alert").filter({ hasText: "Hay 2 problemas que corregir antes de poder guardar nada." });
    await problems.waitFor();
    const listed = await problems.innerText();
    expect(listed).toContain(`Fila 3, columna ${letter} (Overall quality [1-9]): «doce» no es un número. Escriba solo cifras, por ejemplo 12 o 12.5.`);
    expect(listed).toContain(`Fila 4, columna ${letter} (Overall quality [1-9]): Las calificaciones son números enteros del 1 al 9; 12 no es una de ellas.`);
    expect(await page.getByRole("button", { name: /^Guardar \d+ valores$/ }).count()).toBe(0);
    await page.screenshot({ path: path.join(shots, "phone-upload-es.png"), fullPage: true });
    // A file that is no spreadsheet at all is refused whole, in Spanish, saying what it really is.
    await page.getByLabel(/Hoja de cálculo \(\.xlsx o \.csv/).setInputFiles({ name: "cedar-hollow.xlsx", mimeType: "application/pdf", buffer: Buffer.from("%PDF-1.7 not a sheet") });
    await page.getByRole("button", { name: "Revisar el archivo" }).click();
    await page.getByText("Este archivo se llama .xlsx, pero es un PDF. Suba la plantilla de Excel (.xlsx) o un archivo CSV (.csv) con las mismas columnas.").waitFor();

    // She sends the data; the coordinator (whose screens stay English) returns it with a comment on a plot.
    await openSite(page);
    // The photo form speaks Spanish, and so does the server's refusal of a file that is not a picture.
    await page.getByLabel("Foto (JPEG, PNG o WebP, hasta 15 MB)").setInputFiles({ name: "surco.jpg", mimeType: "image/jpeg", buffer: Buffer.from("%PDF-1.7 not a photo") });
    await page.getByRole("button", { name: "Adjuntar foto" }).click();
    await page.getByText("Este archivo no es una imagen JPEG, PNG ni WebP. Solo se pueden adjuntar fotos.").waitFor();
    await page.getByRole("button", { name: "Enviar a revisión" }).first().click();
    await page.getByText(/Usted envió estos datos a revisión/).waitFor();
    const [, trialId, siteId] = page.url().match(/\/portal\/record\/(\d+)\/(\d+)/)!;
    const staff = await newPage(browser);
    await signIn(staff.page, "rosa.delgado@tamarack-valley.example", "seedplot-coordinator-demo");
    await staff.page.goto(`/portal/review/${trialId}/${siteId}`);
    await staff.page.getByLabel("Plot", { exact: true }).selectOption({ index: 1 });
    const plotCode = (await staff.page.getByLabel("Plot", { exact: true }).locator("option:checked").textContent())!.trim();
    await staff.page.getByLabel("Comment for the grower").fill("Por favor, vuelva a contar esta parcela.");
    await staff.page.getByRole("button", { name: "Add comment" }).click();
    await staff.page.getByText(/Comment added/).waitFor();
    await staff.page.getByLabel("Message to the grower (optional)").fill("Gracias, Mei: revise solo esa parcela.");
    await staff.page.getByRole("button", { name: "Return with comments" }).click();
    await staff.page.getByText(/Returned to the grower; waiting for them to send it again/).waitFor();

    const [mail] = await waitForMailTo(GROWER, { subject: /^Revise sus datos: Cedar Hollow Market Garden, Baby-leaf kale/ });
    expect(mail!.text).toContain("Hola, Mei Lin Harrow:");
    expect(mail!.text).toContain("La coordinación le devolvió los datos de Cedar Hollow Market Garden del ensayo «Baby-leaf kale in trays under lights» con preguntas.");
    expect(mail!.text).toContain(`Comentarios:\n- Parcela ${plotCode}: Por favor, vuelva a contar esta parcela.`);
    expect(mail!.text).toContain("Corrija o confirme los valores y luego envíe los datos de nuevo:");
    expect(mail!.text).not.toMatch(/Hello|Your coordinator|Please check/);

    await page.goto("/portal");
    const returned = page.locator("li", { has: page.getByText("Devuelto para corregir") }).first();
    await returned.waitFor();
    expect(await returned.innerText()).toContain("La coordinación escribió: «Gracias, Mei: revise solo esa parcela.»");
    await openSite(page);
    await page.getByRole("heading", { name: "Devuelto por la coordinación" }).waitFor();
    await page.getByText(`Parcela ${plotCode}: Por favor, vuelva a contar esta parcela.`).waitFor();
    await page.getByText("Coordinación: Por favor, vuelva a contar esta parcela.").waitFor();
    await page.screenshot({ path: path.join(shots, "phone-returned-es.png"), fullPage: false });

    // Her printouts are in Spanish: the field sheet, the plot labels and the tray map, treated-seed cautions included.
    const sheets = `/portal/trials/${trialId}/sites/${siteId}/sheets`;
    const field = pdfText(Buffer.from(await (await page.request.get(`${sheets}?kind=sheet`)).body()), "field-sheet-es");
    expect(field).toContain("Hoja de datos de campo");
    expect(field).toMatch(/Parcela\s+Bloque\s+Código/);
    expect(field).toContain("Semillas sembradas");
    expect(field).toContain("Protocolo");
    expect(field).toMatch(/3 bloques; cada variedad una vez en cada bloque/);
    expect(field).toContain("Seguridad y manejo");
    expect(field).toContain("Semilla tratada en este kit");
    expect(field).toMatch(/no es para consumo humano ni\s+animal/);
    expect(field).toMatch(/rigen la etiqueta y las normas\s+locales/);
    expect(field).not.toMatch(/Field data sheet|Safety and handling|Treated seed/);
    const labels = pdfText(Buffer.from(await (await page.request.get(`${sheets}?kind=labels`)).body()), "plot-labels-es");
    expect(labels).toContain("Etiquetas de parcela");
    expect(labels).toMatch(/Bloque \d · Bandeja \d+, inserto \d+/);
    expect(labels).toContain("SEMILLA TRATADA");
    const map = pdfText(Buffer.from(await (await page.request.get(`${sheets}?kind=map`)).body()), "tray-map-es");
    expect(map).toContain("Mapa de bandejas");
    expect(map).toContain("TRATADA");
    expect(map).toMatch(/Página 1 de \d/);
    // The page the printouts are fetched from speaks her language too: the map, the plot list, the cautions.
    await page.goto(`/portal/trials/${trialId}/sites/${siteId}`);
    await page.getByRole("heading", { name: "Dónde va cada código" }).waitFor();
    const layoutPage = await page.locator("main").innerText();
    for (const spanish of ["Hoja de datos de campo (PDF)", "Imprimir esta página", "Toca en cada parcela", "Protocolo y seguridad", "Semilla tratada en este kit", "Todas las parcelas de este sitio"]) expect(layoutPage).toContain(spanish);
    expect(layoutPage).not.toMatch(/Field data sheet|Print this page|Where each code goes|Due on every plot|Protocol and safety|Treated seed in this kit|Every plot at this site/);
    await context.close();

    // Staff set the site's printouts to Spanish: the packing list prints in Spanish for an English-reading coordinator.
    await staff.page.goto("/portal/sites");
    // The same "Saved" stays on screen between two changes, so each change waits for its own answer.
    const printoutLanguageSaved = () => staff.page.waitForResponse((r) => r.request().method() === "POST" && new URL(r.url()).pathname === "/portal/sites");
    let saved = printoutLanguageSaved();
    await staff.page.getByLabel(`Printout language for ${SITE}`).selectOption("es");
    await saved;
    await staff.page.locator("tr", { hasText: SITE }).getByText("Saved").waitFor();
    const packing = pdfText(Buffer.from(await (await staff.page.request.get(`${sheets}?kind=packing`)).body()), "packing-list-es");
    expect(packing).toContain("Lista de empaque del kit de semillas");
    expect(packing).toMatch(/Empacado\s+Código\s+Lote de semilla\s+Tratada\s+Parcelas/);
    expect(packing).toContain("sin tratar");
    // Without a site language, the same list prints in the coordinator's own language.
    saved = printoutLanguageSaved();
    await staff.page.getByLabel(`Printout language for ${SITE}`).selectOption("");
    await saved;
    const english = pdfText(Buffer.from(await (await staff.page.request.get(`${sheets}?kind=packing`)).body()), "packing-list-en");
    expect(english).toContain("Seed kit packing list");
    await staff.context.close();
  }, 180_000);

  it("the public results pages switch language through their address, so each cached page is one language", async () => {
    const { page, context } = await newPage(browser);
    await page.goto("/results");
    await page.getByRole("heading", { name: "Variety trial results" }).waitFor();
    await page.getByRole("link", { name: "Leer en español" }).click();
    await page.waitForURL(/\/results\?lang=es$/);
    await page.getByRole("heading", { name: "Resultados de los ensayos de variedades" }).waitFor();
    expect(await page.locator("html").getAttribute("lang")).toBe("es");
    // Links keep the language; a forged header cannot choose it, only the address does.
    expect(await page.getByRole("link", { name: /Spinach|spinach/ }).first().getAttribute("href")).toMatch(/\?lang=es$/);
    const forged = await page.request.get("/results", { headers: { "x-seedplot-language": "es" } });
    expect(await forged.text()).toContain("Variety trial results");
    await page.screenshot({ path: path.join(shots, "desktop-results-es.png"), fullPage: false });
    // A trial page in Spanish keeps the language in its links; a public page carries no portal wording.
    await page.getByRole("link", { name: /Spinach|spinach/ }).first().click();
    await page.getByRole("heading", { name: "Resumen para productores" }).waitFor();
    expect(await page.getByRole("link", { name: "Descargar el informe en PDF" }).count()).toBe(1);
    expect(await page.getByRole("link", { name: "Resultados", exact: true }).first().getAttribute("href")).toBe("/results?lang=es");
    expect(await (await page.request.get(page.url())).text()).not.toContain("Qué registrar ahora");
    await page.screenshot({ path: path.join(shots, "desktop-trial-es.png"), fullPage: false });
    await page.getByRole("link", { name: "Read in English" }).click();
    await page.getByRole("heading", { name: "Summary for growers" }).waitFor();
    await page.goto("/results?lang=es");
    await page.getByRole("link", { name: "Read in English" }).click();
    await page.waitForURL(/\/results$/);
    await page.getByRole("heading", { name: "Variety trial results" }).waitFor();
    await context.close();
  });
});
