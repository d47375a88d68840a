import { describe, expect, it } from 'vitest';
import { browserForFile, screenshot, signInAs } from '../support/browser';
import { BASE } from '../support/http';
import { makeUser } from '../support/users';
import { db } from '@/db/models';

const browser = browserForFile();

describe('administration on a phone', () => {
  it('finds a user by name, disables them only after a confirmation, and follows it through the audit log filters', async () => {
    const user = await makeUser();
    const name = `Quillon Ashby ${user.email.slice(2, 8)}`;
    await db().User.update({ name }, { where: { id: user.id } });

    const context = await browser().newContext({ viewport: { width: 390, height: 844 } });
    const page = await context.newPage();
    await signInAs(page, 'admin@bandcone.test');
    await page.goto(`${BASE}/admin/users`);
    const search = page.getByRole('search', { name: 'Find users' });
    await search.getByRole('searchbox').fill(name.toLowerCase());
    await search.getByRole('button', { name: 'Find' }).click();
    await page.waitForURL(/\/admin\/users\?q=/);
    await expect(page.locator('[data-testid="user-row"]').count()).resolves.toBe(1);
    const row = page.locator(`[data-testid="user-row"][data-email="${user.email}"]`);
    await expect(row.locator('[data-testid="access-badge"]').getAttribute('data-access')).resolves.toBe('active');

    // the action asks first; cancelling changes nothing
    await row.getByRole('button', { name: `Disable ${user.email}…` }).click();
    await row.getByRole('button', { name: 'Cancel' }).click();
    expect((await db().User.findByPk(user.id))!.disabledAt).toBeNull();
    await row.getByRole('button', { name: `Disable ${user.email}…` }).click();
    await expect(row.getByRole('group').textContent()).resolves.toMatch(/signed out everywhere/);
    await row.getByRole('button', { name: 'Yes, disable' }).click();
    await expect.poll(() => row.locator('[data-testid="access-badge"]').getAttribute('data-access'), { timeout: 15_000 }).toBe('disabled');
    await expect(row.getByRole('button', { name: `Enable ${user.email}…` }).count()).resolves.toBe(1);
    expect((await db().User.findByPk(user.id))!.disabledAt).not.toBeNull();
    await screenshot(page, 'admin-users-390');

    // the audit log, filtered by target and action; the filters stay in the address
    await page.goto(`${BASE}/admin/audit`);
    const filters = page.getByRole('form', { name: 'Filter the audit log' });
    await filters.getByRole('textbox', { name: 'Target' }).fill(user.email);
    await filters.getByRole('combobox', { name: 'What' }).selectOption('user.access_changed');
    await filters.getByRole('button', { name: 'Filter' }).click();
    await page.waitForURL((u) => u.searchParams.get('target') === user.email && u.searchParams.get('action') === 'user.access_changed');
    const rows = page.locator('[data-testid="audit-row"]');
    await expect(rows.count()).resolves.toBe(1);
    await expect(rows.first().textContent()).resolves.toContain(`${user.email}: Contributor, active → Contributor, disabled`);
    await page.reload();
    await expect(filters.getByRole('textbox', { name: 'Target' }).inputValue()).resolves.toBe(user.email);
    await expect(page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth)).resolves.toBeLessThanOrEqual(0);
    await screenshot(page, 'admin-audit-390');

    // a filter that excludes it empties the table; the target link leads back to the user
    await page.goto(`${BASE}/admin/audit?target=${encodeURIComponent(user.email)}&actor=system`);
    await expect(page.locator('[data-testid="audit-empty"]').count()).resolves.toBe(1);
    await page.goto(`${BASE}/admin/audit?target=${encodeURIComponent(user.email)}`);
    await page.locator('[data-testid="audit-row"]').first().getByRole('link', { name: user.email }).click();
    await page.waitForURL(/\/admin\/users\?q=/);
    await expect(page.locator('[data-testid="user-row"]').count()).resolves.toBe(1);
    await context.close();
  });
});
