import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { assertServerUp, baseUrl, demoPassword, launchBrowser, withFailureScreenshot, type BrowserSession } from './support/browser';

async function signIn(page: Page, email: string, password: string): Promise<void> {
  await page.goto('/sign-in');
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByRole('heading', { name: 'Campaigns', exact: true }).waitFor();
}

async function signOut(page: Page): Promise<void> {
  await page.getByRole('button', { name: 'User menu' }).click();
  await page.getByRole('menuitem', { name: 'Sign out' }).click();
  await page.getByRole('button', { name: 'Sign in' }).waitFor();
}

describe('onboarding through an invitation', () => {
  let session: BrowserSession;

  beforeAll(async () => {
    await assertServerUp();
    session = await launchBrowser();
  });

  afterAll(async () => {
    await session?.close();
  });

  it('a lead invites a new reader, who accepts from the e-mail link and lands in the campaign', async () => {
    const { page } = session;
    const stamp = `${Date.now().toString(36)}${Math.random().toString(36).slice(2, 6)}`;
    const campaignName = `Onboarding check ${stamp}`;
    const inviteeEmail = `invitee-${stamp}@e2e.test`;
    const inviteeName = `Ines Invitee ${stamp}`;

    await withFailureScreenshot(page, 'onboarding', async () => {
      // The lead creates a campaign and invites a reader.
      await signIn(page, 'lead@demo.test', demoPassword);
      await page.getByRole('button', { name: 'New campaign' }).first().click();
      const createDialog = page.getByRole('dialog').filter({ hasText: 'New campaign' });
      await createDialog.getByLabel('Name').fill(campaignName);
      await createDialog.getByLabel('Description').fill('Created by the browser test.');
      await createDialog.getByRole('button', { name: 'Create campaign' }).click();
      await page.getByRole('heading', { name: campaignName }).waitFor();
      const campaignPath = new URL(page.url()).pathname;
      expect(campaignPath).toMatch(/^\/campaigns\/[0-9a-f-]{36}$/);

      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Members' }).click();
      await page.getByRole('heading', { name: 'Members', exact: true }).waitFor();
      await page.getByRole('button', { name: 'Invite by e-mail' }).click();
      const inviteDialog = page.getByRole('dialog').filter({ hasText: 'Invite someone to this campaign' });
      await inviteDialog.getByLabel('E-mail').fill(inviteeEmail);
      await expect(inviteDialog.getByRole('checkbox', { name: /Reader/ }).isChecked()).resolves.toBe(true);
      await expect(inviteDialog.getByRole('checkbox', { name: /Lead/ }).isChecked()).resolves.toBe(false);
      await inviteDialog.getByRole('button', { name: 'Send invitation' }).click();
      await page.getByRole('cell', { name: inviteeEmail, exact: true }).waitFor();
      await signOut(page);

      // The administrator reads the captured invitation and follows its link.
      await signIn(page, 'admin@demo.test', demoPassword);
      await page.getByRole('button', { name: 'User menu' }).click();
      await page.locator('.ant-dropdown').getByRole('menuitem', { name: 'Captured e-mail' }).click();
      await page.getByRole('heading', { name: 'Captured e-mail' }).waitFor();
      // Delivery through the catcher is asynchronous; the page polls, so wait for the row.
      const mailRow = page.getByRole('row').filter({ hasText: inviteeEmail }).first();
      await mailRow.waitFor({ timeout: 30_000 });
      await mailRow.click();
      const acceptLink = page.locator('.mail-text a[href*="/invitations/accept?token="]');
      await acceptLink.waitFor();
      const href = await acceptLink.getAttribute('href');
      expect(href).toContain('/invitations/accept?token=');
      if (new URL(href!).origin === new URL(baseUrl).origin) {
        await acceptLink.click();
      } else {
        // The server's APP_URL names another host for the same app; open the same path here.
        const link = new URL(href!);
        await page.goto(`${link.pathname}${link.search}`);
      }

      // The invitee accepts as a new account.
      await page.getByRole('heading', { name: 'You are invited to a campaign' }).waitFor();
      await page.getByText(campaignName).waitFor();
      await page.getByText('Reader', { exact: true }).waitFor();
      await page.getByLabel('Your name').fill(inviteeName);
      await page.getByLabel('Choose a password').fill(`pw-${stamp}-long-enough`);
      await page.getByLabel('Repeat the password').fill(`pw-${stamp}-long-enough`);
      await page.getByRole('button', { name: 'Create account and join' }).click();

      // Lands in the campaign as a reader.
      await page.waitForURL((url) => url.pathname === campaignPath);
      await page.getByRole('heading', { name: campaignName }).waitFor();
      const roles = page.locator('.ant-descriptions-item').filter({ hasText: 'Your roles' });
      await expect(roles.innerText()).resolves.toMatch(/Reader/);
      await expect(roles.innerText()).resolves.not.toMatch(/Lead/);
      await expect(page.getByRole('button', { name: 'User menu' }).innerText()).resolves.toContain(inviteeName);
      // A reader gets no lead controls.
      await expect(page.getByRole('button', { name: 'Edit' }).count()).resolves.toBe(0);
    });
  });
});
