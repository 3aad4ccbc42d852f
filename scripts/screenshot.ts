// Takes screenshots of pages for a visual check: tsx scripts/screenshot.ts OUT_DIR [email password] path...
import { launchBrowser, newPage, signIn } from "../tests/helpers/browser";

const [outDir, ...rest] = process.argv.slice(2);
let email: string | undefined;
let password: string | undefined;
if (rest[0]?.includes("@")) [email, password] = rest.splice(0, 2);
const browser = await launchBrowser();
for (const [label, viewport] of [["desktop", { width: 1280, height: 900 }], ["phone", { width: 390, height: 844 }]] as const) {
  const { page, context } = await newPage(browser, viewport);
  if (email && password) await signIn(page, email, password);
  for (const path of rest) {
    await page.goto(path);
    const name = `${outDir}/${label}${path.replace(/[^a-z0-9]+/gi, "_")}.png`;
    await page.screenshot({ path: name, fullPage: true });
    console.log(name);
  }
  await context.close();
}
await browser.close();
