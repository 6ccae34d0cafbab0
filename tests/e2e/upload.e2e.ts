/**
 * A crew member uploads a demo base log and a demo rover log (made by the demo generator into a
 * temp folder), maps the rover's field column by hand, watches each upload's progress, and finds
 * both logs in the survey's logs table and the rover's log page with its chart and download.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, expect, inject, it } from "vitest";
import type { Browser } from "playwright-core";
import { DEMO_SIGN_INS } from "../../seeds/demo-users";
import { runStep } from "../../scripts/lib/app-process";
import { writeRoverFile } from "../../bench/import-bench";
import { launchBrowser, newContext, screenshot, signIn } from "./support/browser";

const baseUrl = inject("baseUrl");
let browser: Browser;
let dir: string;
let baseFile: string;
let roverFile: string;

type ManifestEntry = { file: string; surveyCode: string; date: string; kind: "base" | "rover"; rows: number };

beforeAll(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "fieldtide-e2e-logs-"));
  await runStep(process.execPath, ["--import", "tsx", "scripts/generate-demo-logs.ts", dir]);
  const manifest = JSON.parse(fs.readFileSync(path.join(dir, "manifest.json"), "utf8")) as ManifestEntry[];
  const day = manifest.filter((m) => m.surveyCode === "BRM-26" && m.date === "2026-05-05");
  baseFile = path.join(dir, day.find((m) => m.kind === "base")!.file);
  // The rover file with its field column renamed to a name no guess knows: the crew maps it by hand.
  const rover = day.find((m) => m.kind === "rover")!;
  const text = fs.readFileSync(path.join(dir, rover.file), "utf8");
  const [header, ...rest] = text.split("\n");
  expect(header.endsWith(",tmi_nT")).toBe(true);
  roverFile = path.join(dir, rover.file.replace(".csv", "_renamed.csv"));
  fs.writeFileSync(roverFile, [header.replace(/,tmi_nT$/, ",sensor_value"), ...rest].join("\n"));
  browser = await launchBrowser();
}, 120_000);

afterAll(async () => {
  await browser?.close();
  if (dir) fs.rmSync(dir, { recursive: true, force: true });
});

const crew = DEMO_SIGN_INS.find((u) => u.email.startsWith("crew@"))!;

it("crew uploads a base and a rover log, maps a column, sees progress and both logs in the table", async () => {
  const context = await newContext(browser, baseUrl);
  const page = await context.newPage();
  await signIn(page, crew.email, crew.password);
  await page.goto("/surveys");
  await page.getByRole("link", { name: /BRM-26|Brennock/ }).first().click();
  await page.waitForURL(/\/surveys\/[^/]+$/);
  const surveyPath = new URL(page.url()).pathname;

  await page.goto(`${surveyPath}/logs`);
  await page.getByRole("link", { name: "Upload logs" }).first().click();
  await page.waitForURL(/\/logs\/upload$/);
  await page.locator("#log-files").setInputFiles([baseFile, roverFile]);

  const baseCard = page.getByRole("region", { name: `Log file ${path.basename(baseFile)}` });
  const roverCard = page.getByRole("region", { name: `Log file ${path.basename(roverFile)}` });
  await baseCard.waitFor();
  await roverCard.waitFor();

  // Base: kind guessed from the name; the demo base logs local time of the survey (Europe/London).
  expect(await baseCard.getByLabel("Kind").inputValue()).toBe("base");
  await baseCard.getByLabel("Instrument label").fill("BASE-PP-07");
  await baseCard.getByLabel("Sensor type").selectOption("proton-precession");
  await baseCard.getByLabel("Time basis").selectOption("local");
  await baseCard.getByLabel("Base station site").fill("Brennock Moor base (gatehouse paddock)");
  expect(await baseCard.getByLabel("Field column").inputValue()).toBe("Field (nT)");

  // Rover: the preview shows the unknown column as unused until the crew maps it.
  expect(await roverCard.getByLabel("Kind").inputValue()).toBe("rover");
  await roverCard.getByLabel("Instrument label").fill("ROVER-OV-12");
  await roverCard.getByLabel("Sensor type").selectOption("overhauser");
  expect(await roverCard.getByLabel("Field column").inputValue()).toBe("");
  await roverCard.getByLabel("Field column").selectOption("sensor_value");
  await roverCard.getByLabel("Save this mapping as a profile (optional)").fill("Rover export, renamed field");
  await screenshot(page, "upload-before");

  await page.getByRole("button", { name: "Upload 2 files" }).click();
  for (const card of [baseCard, roverCard]) {
    await card.getByText("Imported", { exact: true }).waitFor({ timeout: 60_000 });
    const progress = card.getByRole("progressbar");
    expect(await progress.getAttribute("value")).toBe("1");
    await expect(card.getByRole("status").innerText()).resolves.toMatch(/Imported [\d,]+ readings on 2026-05-05/);
  }
  expect(await roverCard.getByRole("status").innerText()).toMatch(/Imported 8,000 readings/);
  await screenshot(page, "upload-after");

  // The logs table lists both, with their readings and the survey day.
  await page.getByRole("link", { name: /See the logs table/ }).click();
  await page.waitForURL(/\/logs(\?.*)?$/);
  const table = page.getByRole("table");
  await table.getByRole("link", { name: path.basename(baseFile) }).waitFor();
  await table.getByRole("link", { name: path.basename(roverFile) }).waitFor();
  const tableText = await table.innerText();
  expect(tableText).toContain("8,000");
  expect(tableText).toContain("13,301");
  expect(tableText).toContain("2026-05-05");

  // Filter by kind (server-side) → only the base log.
  await page.getByLabel("Kind").selectOption("base");
  await page.waitForURL(/kind=base/);
  await expect.poll(async () => page.getByRole("table").innerText(), { timeout: 15_000 }).not.toContain(path.basename(roverFile));
  expect(await page.getByRole("table").innerText()).toContain(path.basename(baseFile));
  await screenshot(page, "logs-table");

  // The rover's log page: metadata, chart, original download.
  await page.goto(`${surveyPath}/logs`);
  await page.getByRole("link", { name: path.basename(roverFile) }).click();
  await page.waitForURL(/\/logs\/\d+$/);
  await page.getByRole("heading", { name: "Total field against time" }).waitFor();
  await page.locator(".recharts-line-curve").first().waitFor();
  const body = await page.locator("main").innerText();
  expect(body).toContain("ROVER-OV-12");
  expect(body).toMatch(/field: sensor_value/);
  const href = await page.getByRole("link", { name: "Download the original" }).getAttribute("href");
  const res = await context.request.get(href!);
  expect(res.status()).toBe(200);
  expect(await res.text()).toBe(fs.readFileSync(roverFile, "utf8"));
  await screenshot(page, "log-page");
  await context.close();
});

it("crew creates an API token on the profile page (shown once) and a field laptop uploads with it", async () => {
  const context = await newContext(browser, baseUrl);
  const page = await context.newPage();
  await signIn(page, crew.email, crew.password);
  await page.getByRole("link", { name: "Profile" }).click();
  await page.waitForURL(/\/profile$/);
  await page.getByLabel("Token name").fill("Truck laptop");
  await page.getByRole("button", { name: "Create token" }).click();
  const token = await page.getByLabel("New API token").inputValue();
  expect(token).toMatch(/^ftk_/);
  await screenshot(page, "profile-token");
  await page.reload();
  expect(await page.locator("main").innerText()).not.toContain(token);
  expect(await page.locator("main").innerText()).toContain("Truck laptop");

  // The laptop: no cookie, only the token (as the curl line in the README does).
  const surveys = await page.goto("/surveys");
  expect(surveys?.status()).toBe(200);
  const href = await page.getByRole("link", { name: /BRM-26|Brennock/ }).first().getAttribute("href");
  const surveyId = href!.split("/").pop()!;
  const form = new FormData();
  form.append("kind", "base");
  form.append("baseSiteName", "Gatehouse paddock");
  form.append("timeBasis", "local");
  form.append("file", new Blob([fs.readFileSync(baseFile.replace("2026-05-05", "2026-05-06"))]), path.basename(baseFile).replace("2026-05-05", "2026-05-06"));
  const res = await fetch(`${baseUrl}/api/v1/surveys/${surveyId}/logs`, { method: "POST", headers: { authorization: `Bearer ${token}` }, body: form });
  expect(res.status).toBe(201);
  const body = await res.json();
  expect(body.log).toMatchObject({ readingCount: 13_801, days: ["2026-05-06"] });
  const listed = await fetch(`${baseUrl}/api/v1/surveys/${surveyId}/logs?day=2026-05-06`, { headers: { authorization: `Bearer ${token}` } });
  expect((await listed.json()).items.map((i: { id: number }) => i.id)).toContain(body.log.id);

  // A rover log over 10 MB streams through to the import (nothing in front of the route may buffer or cut it).
  const bigFile = path.join(dir, "big-rover.csv");
  writeRoverFile(bigFile, 200_000);
  expect(fs.statSync(bigFile).size).toBeGreaterThan(12 * 1024 * 1024);
  const bigForm = new FormData();
  bigForm.append("kind", "rover");
  bigForm.append("instrument", "ROVER-BIG");
  bigForm.append("file", new Blob([fs.readFileSync(bigFile)]), "big-rover.csv");
  const big = await fetch(`${baseUrl}/api/v1/surveys/${surveyId}/logs`, { method: "POST", headers: { authorization: `Bearer ${token}` }, body: bigForm });
  expect(big.status).toBe(201);
  expect((await big.json()).log.readingCount).toBe(200_000);

  // Revoked: the laptop is refused.
  await page.goto("/profile");
  await page.getByRole("button", { name: "Revoke" }).first().click();
  await page.getByRole("button", { name: "Yes, revoke" }).click();
  await page.getByText("Revoked").first().waitFor();
  const after = await fetch(`${baseUrl}/api/v1/surveys/${surveyId}/logs`, { headers: { authorization: `Bearer ${token}` } });
  expect(after.status).toBe(401);
  await context.close();
});
