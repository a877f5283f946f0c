import type { Page } from 'playwright-core';
import { expect } from 'vitest';

/** Finishes a pass from the entry screen's closing dialog with Enter alone, as a reader does. */
export async function finishByKeyboard(page: Page, pass: 1 | 2): Promise<void> {
  const dialog = page.getByRole('dialog').filter({ hasText: `Finish pass ${pass}` });
  await dialog.waitFor();
  const button = dialog.getByRole('button', { name: `Finish pass ${pass}` });
  // The button takes the focus once the last row has reached the server.
  await expect.poll(() => button.evaluate((el) => el === document.activeElement), { timeout: 20_000 }).toBe(true);
  await page.keyboard.press('Enter');
  await dialog.waitFor({ state: 'detached', timeout: 20_000 });
}
