import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../helpers/app';
import { launch, PHONE, screenshot, signIn, WIDE } from './browser';
import { PASSWORD_RULE } from '../../constants/passwords';

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

describe('invitations on screen', () => {
  it('says the invitation was e-mailed, lists it with send-again and cancel, and the invited person sees the password rule', async () => {
    const b = await launch(WIDE);
    try {
      await signIn(b.page, s.baseUrl, 'admin@fernleigh.example');
      await b.page.getByTestId('nav-People').click();
      await b.page.getByTestId('invite-email').fill('e2e-invitee@example.org');
      await b.page.getByRole('button', { name: 'Send invitation' }).click();
      await b.page.getByText('Invitation e-mailed to e2e-invitee@example.org').waitFor();
      const row = b.page.getByTestId('invitation-e2e-invitee@example.org');
      await row.getByRole('button', { name: 'Send again' }).waitFor();
      await row.getByRole('button', { name: 'Cancel invitation' }).waitFor();
      expect(await b.page.getByText(/token=/).count()).toBe(0);
      await screenshot(b.page, 'people-invitation-emailed-wide');
      await row.getByRole('button', { name: 'Send again' }).click();
      await b.page.getByText(/Sent again to e2e-invitee@example.org/).waitFor();
      // The invited person opens the link from the e-mail (signed out, in a fresh browser).
      const token = await s.tokenFor('e2e-invitee@example.org', 'invitation');
      const p = await launch(PHONE);
      try {
        await p.page.goto(`${s.baseUrl}/link?token=${token}`);
        await p.page.getByRole('heading', { name: 'Accept your invitation' }).waitFor();
        await p.page.getByText(PASSWORD_RULE).first().waitFor();
        await p.page.getByText('I already have an account: sign in to accept').waitFor();
        await screenshot(p.page, 'invitation-link-phone');
      } finally {
        await p.close();
      }
    } finally {
      await b.close();
    }
  });
});
