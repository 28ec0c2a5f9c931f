/*
 * browser.mjs - the page of `deltak explore` in a real browser (Debian's
 * headless Chromium, driven by playwright-core): it loads a design from
 * the address, a slider is moved with the keyboard, and the numbers
 * shown must be the command line's for the new state; the address must
 * follow; a bookmarked address must restore the design; a bad wavelength
 * must show the command's message; the saved design file must run with
 * `deltak run`; screenshots are written for a person to look at.
 *
 * Usage: node browser.mjs DELTAK URL OUTDIR   (the server already runs)
 * Prints "browser: N passed, M failed".
 */
import { execFileSync } from "node:child_process";
import { createRequire } from "node:module";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";

const [dk, base, outdir] = process.argv.slice(2);
const require = createRequire(path.resolve(process.env.NODE_MODULES_DIR) + "/");
const { chromium } = require("playwright-core");

let passed = 0, failed = 0;
function check(name, ok, detail) {
    if (ok) {
        passed++;
    } else {
        failed++;
        console.log("not ok: " + name + (detail ? " " + detail : ""));
    }
}

function cli(args) {
    return JSON.parse(execFileSync(dk, args, {stdio: ["ignore", "pipe", "ignore"]}));
}

/* The value shown for a key (numbers of the operating point). */
async function shown(page, key) {
    const t = await page.locator(`dd[data-key="${key}"]`).first().innerText();
    return parseFloat(t);
}

async function settled(page, after) {
    await page.waitForFunction(
        (g) => document.body.dataset.ready === "1" &&
               Number(document.body.dataset.generation) > g &&
               document.getElementById("status").textContent === "up to date",
        after, {timeout: 60000});
}

const generationOf = (page) =>
    page.evaluate(() => Number(document.body.dataset.generation || 0));

/* Equal to the digits the page shows. */
const sameN = (a, b, n) => Number(a.toPrecision(n)) === Number(Number(b).toPrecision(n));
const same6 = (a, b) => sameN(a, b, 6);

const browser = await chromium.launch({
    executablePath: process.env.CHROMIUM || "/usr/bin/chromium",
    args: ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic",
           "--no-first-run", "--disable-background-networking",
           "--disable-component-update", "--disable-sync"],
});
const context = await browser.newContext({viewport: {width: 1400, height: 1000},
                                          acceptDownloads: true});
const page = await context.newPage();
const errors = [];
page.on("pageerror", (e) => errors.push(e.message));

try {
    /* 1. A design from the address (the demo's 3.4 um idler source). */
    const start = "#crystal=MgO:LN&pump=1064nm&idler=3.4um&temp=40&period=30.5&length=20";
    await page.goto(base + start);
    await settled(page, 0);
    const c40 = cli(["period", "--crystal", "MgO:LN", "--pump", "1064nm",
                     "--period", "30.5um", "--temp", "40", "--json"]);
    const idler40 = await shown(page, "idler_um");
    check("idler-at-40C-is-cli", same6(idler40, c40.wavelengths_um.idler),
          `${idler40} vs ${c40.wavelengths_um.idler}`);
    check("signal-at-40C-is-cli",
          same6(await shown(page, "signal_um"), c40.wavelengths_um.signal));
    for (const id of ["tuning-img", "acceptance-img"])
        check(id + "-drawn", await page.locator("#" + id).evaluate(
            (img) => img.complete && img.naturalWidth > 100));
    const rows = await page.locator("#gvm-table tr").count();
    check("gvm-table", rows >= 7, `${rows} rows`);
    const tol = cli(["tolerance", "--crystal", "MgO:LN", "--pump", "1064nm",
                     "--idler", c40.wavelengths_um.idler + "um", "--period",
                     "30.5um", "--temp", "40", "--length", "20mm", "--json"]);
    const fwhm = parseFloat(await page.locator('dd[data-key="temperature_fwhm_C"]').innerText());
    check("temperature-fwhm-is-cli",
          Number(fwhm.toPrecision(4)) === Number(tol.temperature_fwhm_C.toPrecision(4)),
          `${fwhm} vs ${tol.temperature_fwhm_C}`);
    check("safety-caution", (await page.locator("#safety").innerText())
          .includes("laser safety officer"));
    await page.screenshot({path: path.join(outdir, "explore-start.png"), fullPage: true});

    /* 2. Move the temperature slider with the keyboard: 20 steps of
     * 0.5 C, from 40 to 50 C. */
    const g = await generationOf(page);
    await page.locator("#temp").focus();
    for (let i = 0; i < 20; i++)
        await page.keyboard.press("ArrowRight");
    await settled(page, g);
    const c50 = cli(["period", "--crystal", "MgO:LN", "--pump", "1064nm",
                     "--period", "30.5um", "--temp", "50", "--json"]);
    const idler50 = await shown(page, "idler_um");
    check("slider-moved-to-50", (await page.locator("#temp-out").innerText()) === "50");
    check("idler-at-50C-is-cli", same6(idler50, c50.wavelengths_um.idler),
          `${idler50} vs ${c50.wavelengths_um.idler}`);
    check("idler-moved", idler50 !== idler40, `${idler40} -> ${idler50}`);
    const address = page.url();
    check("state-in-address", address.includes("temp=50") &&
          address.includes("period=30.5"), address);
    await page.screenshot({path: path.join(outdir, "explore-slider.png"), fullPage: true});

    /* 3. A bookmark restores the design. */
    const again = await context.newPage();
    await again.goto(address);
    await settled(again, 0);
    check("bookmark-restores", same6(await shown(again, "idler_um"),
                                     c50.wavelengths_um.idler));

    /* 4. The design file runs with `deltak run`; the figure downloads. */
    const [dl] = await Promise.all([page.waitForEvent("download"),
                                    page.click("#save-design")]);
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "explore-design-"));
    const file = path.join(dir, "design.dk");
    await dl.saveAs(file);
    const text = fs.readFileSync(file, "utf8");
    check("design-file", text.includes("title: ") &&
          text.includes("period --crystal MgO:LiNbO3 --pump 1064nm --period 30.5um --temp 50"),
          text);
    let ran = false;
    try {
        execFileSync(dk, ["run", file], {stdio: "ignore"});
        ran = fs.existsSync(path.join(dir, "report.md")) &&
              fs.existsSync(path.join(dir, "tuning.svg"));
    } catch (e) { /* ran stays false */ }
    check("design-file-runs", ran);
    const [fig] = await Promise.all([
        page.waitForEvent("download"),
        page.click('.save-figure[data-figure="tuning"] button[data-format="pdf"]')]);
    const pdf = path.join(dir, "tuning.pdf");
    await fig.saveAs(pdf);
    check("figure-pdf", fs.readFileSync(pdf).subarray(0, 5).toString() === "%PDF-");
    fs.rmSync(dir, {recursive: true});

    /* The oven temperature for the wanted idler with this grating (the
     * demo's question), as the command line gives it. */
    const oven = cli(["period", "--crystal", "MgO:LN", "--pump", "1064nm",
                      "--idler", "3.4um", "--period", "30.5um", "--json"]);
    check("oven-is-cli", sameN(await shown(page, "oven_C"), oven.temperature_C, 5),
          `${await shown(page, "oven_C")} vs ${oven.temperature_C}`);

    /* 5. A grating that sends the idler outside the data set's fitted
     * range: the flag stands beside the number. */
    const far = await context.newPage();
    await far.goto(base + "#crystal=MgO:LN&pump=1064nm&idler=3.4um&temp=40&period=27.5&length=20");
    await settled(far, 0);
    const flag = await far.locator('dd[data-key="idler_um"] .flag').innerText();
    check("range-flag-beside-idler", flag.includes("idler"), flag);

    /* 6. A bare number: the command's message on the page. */
    const bad = await context.newPage();
    await bad.goto(base + "#crystal=MgO:LN&pump=1064&idler=3.4um&temp=40");
    await bad.waitForFunction(() => document.getElementById("status").textContent === "up to date",
                              null, {timeout: 60000});
    const notes = await bad.locator("#op-notes").innerText();
    check("bare-number-message", notes.includes("has no unit"), notes);
    await bad.screenshot({path: path.join(outdir, "explore-bad-input.png"), fullPage: true});

    /* 7. A birefringent design: the angle is the command line's. */
    const bbo = await context.newPage();
    await bbo.goto(base + "#crystal=BBO&scheme=angle&process=shg&fundamental=1030nm&type=I&length=2&temp=25");
    await settled(bbo, 0);
    const ang = cli(["angle", "--crystal", "BBO", "--fundamental", "1030nm",
                     "--type", "I", "--temp", "25", "--json"]);
    const theta = await shown(bbo, "design_theta_deg");
    check("bbo-theta-is-cli", same6(theta, ang.solutions[ang.chosen].theta_deg),
          `${theta} vs ${ang.solutions[0].theta_deg}`);
    await bbo.screenshot({path: path.join(outdir, "explore-bbo.png"), fullPage: true});
    check("no-page-errors", errors.length === 0, errors.join("; "));
} catch (e) {
    check("browser-run", false, e.stack || String(e));
} finally {
    await browser.close();
}
console.log(`browser: ${passed} passed, ${failed} failed`);
process.exit(failed ? 1 : 0);
