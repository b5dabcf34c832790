import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../helpers/app';
import { launch, PHONE, screenshot, signIn, WIDE } from './browser';

let s: TestServer;
beforeAll(async () => {
  s = await startTestServer({ env: { WEB_DIST: process.env.KEELSON_WEB_DIST ?? 'dist' } });
});
afterAll(async () => s?.close());

async function menuLabels(page: import('playwright-core').Page): Promise<string[]> {
  const nav = page.getByRole('navigation').first();
  await nav.getByRole('link').first().waitFor();
  return (await nav.getByRole('link').allInnerTexts()).map((t) => t.trim()).filter(Boolean);
}

describe('signed-in menus follow the permission table', () => {
  it('shows the administrator People and Activity, and the board reviewer neither', async () => {
    const b = await launch(WIDE);
    try {
      await signIn(b.page, s.baseUrl, 'admin@fernleigh.example');
      const adminMenu = await menuLabels(b.page);
      expect(adminMenu).toEqual(expect.arrayContaining(['Overview', 'People', 'Activity', 'Account']));
      await b.page.getByTestId('nav-People').click();
      await b.page.getByText('admin@fernleigh.example').first().waitFor();
      await screenshot(b.page, 'people-admin-wide');
      await b.page.getByTestId('nav-Activity').click();
      await b.page.getByText('signed in').first().waitFor();
      await screenshot(b.page, 'activity-admin-wide');
      await b.page.getByRole('button', { name: 'Sign out' }).click();
      await b.page.getByRole('heading', { name: 'Sign in' }).waitFor();

      await signIn(b.page, s.baseUrl, 'board@fernleigh.example');
      const boardMenu = await menuLabels(b.page);
      expect(boardMenu).not.toContain('People');
      expect(boardMenu).not.toContain('Activity');
      expect(boardMenu).toContain('Account');
      expect(boardMenu).not.toEqual(adminMenu);
      await screenshot(b.page, 'overview-board-wide');
    } finally {
      await b.close();
    }
  });

  it('uses bottom navigation on a phone and lets a person with two schemes switch between them', async () => {
    const b = await launch(PHONE);
    try {
      await signIn(b.page, s.baseUrl, 'actuary@fernleigh.example');
      const picker = b.page.getByTestId('scheme-picker');
      await picker.waitFor();
      await picker.getByRole('radio', { name: /Brackenfold/ }).click();
      await b.page.getByRole('heading', { name: 'Brackenfold Cooperative Savings Plan' }).waitFor();
      const box = await b.page.getByRole('navigation').first().boundingBox();
      expect(box!.y).toBeGreaterThan(PHONE.height / 2);
      await screenshot(b.page, 'overview-actuary-phone');
      // The phone bar holds four entries; the rest open from "More".
      const bar = await menuLabels(b.page);
      expect(bar.length).toBeLessThanOrEqual(5);
      await b.page.getByTestId('nav-More').click();
      const more = b.page.getByTestId('more-menu');
      await more.waitFor();
      await expect(more.getByRole('link').count()).resolves.toBeGreaterThan(0);
      await screenshot(b.page, 'more-menu-actuary-phone');
      await more.getByRole('link', { name: 'Account' }).click();
      await b.page.getByRole('heading', { name: 'My account' }).waitFor();
      expect(await more.count()).toBe(0);
    } finally {
      await b.close();
    }
  });
});
