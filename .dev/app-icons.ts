// Draws the installable app's icons from Patina's own mark (public/favicon.svg)
// with Debian's chromium: `npx tsx .dev/app-icons.ts`. The PNGs are committed;
// run this again only when the mark changes.
import { readFileSync } from "node:fs";
import { chromium } from "playwright-core";

const mark = readFileSync("public/favicon.svg", "utf8");
// Maskable icons are cut to a circle or squircle by the phone: the drawing sits
// inside the middle 80% on a full-bleed background of the mark's own green.
const maskable = mark
  .replace('<rect width="32" height="32" rx="8" fill="#22604f"/>', '<rect width="32" height="32" fill="#22604f"/><g transform="translate(6.4 6.4) scale(0.6)">')
  .replace("</svg>", "</g></svg>");

const icons = [
  { file: "public/icons/patina-192.png", size: 192, svg: mark },
  { file: "public/icons/patina-512.png", size: 512, svg: mark },
  { file: "public/icons/patina-maskable-512.png", size: 512, svg: maskable },
];

const browser = await chromium.launch({
  executablePath: process.env.PATINA_CHROMIUM ?? "/usr/bin/chromium",
  args: ["--no-sandbox", "--disable-gpu"],
});
try {
  for (const { file, size, svg } of icons) {
    const page = await browser.newPage({ viewport: { width: size, height: size } });
    const sized = svg.replace("<svg ", `<svg width="${size}" height="${size}" `);
    await page.setContent(`<style>html,body{margin:0;background:transparent}svg{display:block}</style>${sized}`);
    await page.screenshot({ path: file, omitBackground: true });
    await page.close();
    console.log(`[app-icons] ${file} (${size} px)`);
  }
} finally {
  await browser.close();
}
