import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';

export const ARTIFACTS = path.resolve(__dirname, '../../test-artifacts/screenshots');
export const PHONE = { width: 390, height: 844 };
export const WIDE = { width: 1280, height: 800 };

/** Debian's Chromium with a fresh profile (see DEVELOPERS.md for the flags). */
export async function launch(viewport = WIDE): Promise<{ context: BrowserContext; page: Page; close: () => Promise<void> }> {
  const dist = path.resolve(__dirname, '../..', process.env.KEELSON_WEB_DIST ?? 'dist');
  if (!fs.existsSync(path.join(dist, 'index.html'))) throw new Error(`${dist} has no web build: run \`npm run build:web\` first`);
  const profile = fs.mkdtempSync(path.join(os.tmpdir(), 'keelson-chromium-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    headless: true,
    viewport,
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
  const page = context.pages()[0] ?? (await context.newPage());
  return {
    context,
    page,
    close: async () => {
      await context.close();
      fs.rmSync(profile, { recursive: true, force: true });
    },
  };
}

export async function screenshot(page: Page, name: string) {
  fs.mkdirSync(ARTIFACTS, { recursive: true });
  await page.screenshot({ path: path.join(ARTIFACTS, `${name}.png`), fullPage: false });
}

export async function signIn(page: Page, baseUrl: string, email: string, password = 'keelson-demo-2026') {
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel('E-mail address').fill(email);
  await page.getByLabel('Password', { exact: true }).fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByRole('navigation').first().waitFor();
}
