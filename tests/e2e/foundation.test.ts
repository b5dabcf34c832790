import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../helpers/app';
import { launch, PHONE, screenshot, WIDE } from './browser';

let s: TestServer;
beforeAll(async () => {
  s = await startTestServer({ env: { WEB_DIST: process.env.KEELSON_WEB_DIST ?? 'dist' } });
});
afterAll(async () => s?.close());

describe('the exported web build', () => {
  it.each([
    ['phone', PHONE],
    ['wide', WIDE],
  ])('renders the sign-in screen with the shipped font at %s size', async (name, viewport) => {
    const b = await launch(viewport);
    try {
      await b.page.goto(`${s.baseUrl}/sign-in`);
      const heading = b.page.getByRole('heading', { name: 'Sign in' });
      await heading.waitFor();
      // The shipped family must be loaded, not merely named in CSS.
      const loaded = await b.page.evaluate(async () => {
        await document.fonts.ready;
        return document.fonts.check('16px SourceSans3_700Bold') && [...document.fonts].some((f) => f.family.includes('SourceSans3') && f.status === 'loaded');
      });
      expect(loaded).toBe(true);
      const family = await heading.evaluate((el) => getComputedStyle(el).fontFamily);
      expect(family).toContain('SourceSans3');
      await expect(b.page.getByLabel('E-mail address')).toBeDefined();
      await screenshot(b.page, `sign-in-${name}`);
    } finally {
      await b.close();
    }
  });

  it('serves deep links through the single-page fallback', async () => {
    const res = await fetch(`${s.baseUrl}/some/deep/link`);
    expect(res.status).toBe(200);
    expect(await res.text()).toContain('<div id="root">');
  });
});
