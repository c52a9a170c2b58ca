import { describe, expect, it } from 'vitest';
import { browserPool, hydrated, outboxLink, PHONE, shot, signIn, visit, type Browser } from './helpers/browser';

const stamp = Date.now().toString(36);
const browser = browserPool();

async function signUp(b: Browser, name: string, email: string, password: string, open = true) {
  if (open) await visit(b.page, '/sign-up');
  else await hydrated(b.page);
  await b.page.getByLabel('Your name').fill(name);
  await b.page.getByLabel('E-mail').fill(email);
  await b.page.getByLabel('Password').fill(password);
  await b.page.getByRole('button', { name: 'Create account' }).click();
  // Sign-up answers every address alike; the e-mailed link confirms a new account, signs it in and
  // opens the page it was heading for.
  await b.page.getByText('Check your e-mail').waitFor();
  const link = await outboxLink(b.page, email);
  expect(link).toContain('/api/auth/verify-email');
  await b.page.goto(link);
}

describe('platform in the browser', () => {
  it('signs up, starts a team, invites a colleague who joins with the chosen role', async () => {
    const owner = await browser();
    const lead = `lead-${stamp}@example.test`;
    await signUp(owner, 'Rowan Test', lead, 'long-enough-pass');
    await owner.page.waitForURL('**/teams/new');
    await hydrated(owner.page);
    await owner.page.getByLabel('Team name').fill(`Kestrel Works ${stamp}`);
    await owner.page.getByRole('button', { name: 'Create team' }).click();
    await owner.page.waitForURL('**/team');
    await hydrated(owner.page);
    await expect.poll(() => owner.page.getByTestId('my-role').textContent()).toBe('owner');

    const colleague = `colleague-${stamp}@example.test`;
    await owner.page.getByLabel('E-mail').fill(colleague);
    await owner.page.getByLabel('Role', { exact: true }).selectOption('technician');
    await owner.page.getByRole('button', { name: 'Send invitation' }).click();
    await owner.page.getByText(`Invitation sent to ${colleague}`).waitFor();
    await owner.page.getByTestId('invitations').getByText(colleague).waitFor();
    await shot(owner.page, 'team-members-desktop');

    const link = await outboxLink(owner.page, colleague);
    expect(link).toContain('/invitations/accept?token=');

    const second = await browser({ viewport: PHONE });

    await visit(second.page, link);
    await expect.poll(() => second.page.getByTestId('invited-role').textContent()).toBe('technician');
    await second.page.getByRole('main').getByRole('link', { name: 'Create account' }).click();
    await second.page.waitForURL('**/sign-up?next=**');
    await signUp(second, 'Sam Colleague', colleague, 'another-long-pass', false);
    await second.page.waitForURL('**/invitations/accept**');
    await hydrated(second.page);
    await second.page.getByRole('button', { name: /^Join/ }).click();
    await second.page.waitForURL('**/team');
    await expect.poll(() => second.page.getByTestId('my-role').textContent()).toBe('technician');
    await shot(second.page, 'team-members-phone');

    await visit(owner.page, '/team');
    const row = owner.page.locator(`tr[data-email="${colleague}"]`);
    await expect.poll(() => row.getByRole('combobox').inputValue()).toBe('technician');

    // Changing the role asks first, in the row; "Keep" changes nothing, "Change role" saves and says so.
    const roleOf = async () => ((await (await owner.page.request.get('/api/members')).json()).members as { email: string; role: string }[]).find((m) => m.email === colleague)!.role;
    await row.getByRole('combobox').selectOption('engineer');
    const ask = row.getByTestId('role-confirm');
    expect(await ask.textContent()).toContain('from Technician to Engineer?');
    expect(await roleOf()).toBe('technician');
    await ask.getByRole('button', { name: 'Keep Technician' }).click();
    await ask.waitFor({ state: 'detached' });
    expect(await row.getByRole('combobox').inputValue()).toBe('technician');
    await row.getByRole('combobox').selectOption('engineer');
    await shot(owner.page, 'team-role-confirm-desktop', false);
    await ask.getByRole('button', { name: 'Change role' }).click();
    await row.getByRole('status').getByText('Saved: Sam Colleague’s role is now Engineer.').waitFor();
    expect(await roleOf()).toBe('engineer');
  });

  it('shows a clear message for a wrong password, then signs in', async () => {
    const b = await browser();
    b.allow('the server responded with a status of 401');
    await visit(b.page, '/sign-in');
    await b.page.getByLabel('E-mail').fill('engineer@fernhollow.test');
    await b.page.getByLabel('Password').fill('not-the-password');
    await b.page.getByRole('button', { name: 'Sign in' }).click();
    await b.page.getByRole('alert').getByText('That e-mail and password do not match an account.').waitFor();
    await shot(b.page, 'sign-in-wrong-password');
    await signIn(b.page, 'engineer@fernhollow.test');
    await expect.poll(() => b.page.getByTestId('home-role').textContent()).toBe('engineer');
  });

  it('resets a forgotten password through the e-mailed link', async () => {
    const b = await browser();
    const email = `forgetful-${stamp}@example.test`;
    await signUp(b, 'Forgetful Person', email, 'first-password-1');
    await b.page.waitForURL('**/teams/new');
    await b.page.getByRole('button', { name: 'Sign out' }).click();
    await b.page.waitForURL('**/sign-in');
    await hydrated(b.page);

    await b.page.getByRole('link', { name: 'Forgotten your password?' }).click();
    await b.page.waitForURL('**/forgot-password');
    await hydrated(b.page);
    await b.page.getByLabel('E-mail').fill(email);
    await b.page.getByRole('button', { name: 'Send reset link' }).click();
    await b.page.getByText('a reset link is on its way').waitFor();

    const link = await outboxLink(b.page, email);
    await b.page.goto(link);
    await b.page.waitForURL('**/reset-password?token=**');
    await hydrated(b.page);
    await b.page.getByLabel('New password', { exact: true }).fill('second-password-2');
    await b.page.getByLabel('Repeat the new password').fill('second-password-2');
    await b.page.getByRole('button', { name: 'Set new password' }).click();
    await b.page.getByText('Password changed.').waitFor();

    await signIn(b.page, email, 'second-password-2');
    expect(new URL(b.page.url()).pathname).toBe('/teams/new');
  });

  it('hides what a role cannot do', async () => {
    const viewer = await browser();
    await signIn(viewer.page, 'viewer@fernhollow.test');
    await visit(viewer.page, '/team');
    await viewer.page.getByTestId('members').waitFor();
    expect(await viewer.page.getByRole('button', { name: 'Send invitation' }).count()).toBe(0);
    expect(await viewer.page.getByRole('button', { name: 'Remove' }).count()).toBe(0);
    expect(await viewer.page.getByText('Team settings').count()).toBe(0);

    const admin = await browser();
    await signIn(admin.page, 'admin@fernhollow.test');
    await visit(admin.page, '/team');
    await admin.page.getByRole('button', { name: 'Send invitation' }).waitFor();
    expect(await admin.page.getByRole('button', { name: 'Remove' }).count()).toBeGreaterThan(0);
    expect(await admin.page.getByRole('button', { name: 'Delete team' }).count()).toBe(0);
  });
});
