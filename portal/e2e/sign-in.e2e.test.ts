import { describe, expect, it } from 'vitest';
import { OUTSIDER } from '@localis/seeds/scenario';
import { demoPerson, isProviderForm, portalUrl, screenshot, signIn, startSignIn, submitProviderForm, useBrowser } from './browser';

const ADMIN_NAV = ['nav-people', 'nav-institutions', 'nav-audit'] as const;
const EVERYONE_NAV = ['nav-home', 'nav-profile'] as const;

const ROLES = [
  { role: 'admin', email: 'dana.whitfield@coldwater-network.example', admin: true },
  { role: 'pi', email: 'tobias.wendt@brennmoor.example', admin: false },
  { role: 'researcher', email: 'ines.albrecht@brennmoor.example', admin: false },
  { role: 'committee', email: 'henrik.solberg@kestrel.example', admin: false },
  { role: 'billing', email: 'felix.marlow@orrin-qd.example', admin: false },
] as const;

const pathOf = (url: string) => new URL(url).pathname;

describe('sign-in', () => {
  const browser = useBrowser();

  describe('each demo role', () => {
    for (const { role, email, admin } of ROLES) {
      it(`should show the ${role}'s name and navigation, and sign out of Localis and the provider when ${role} signs in and out`, async () => {
        const page = browser.page;
        const person = demoPerson(email);

        await signIn(page, email);
        expect(pathOf(page.url())).toBe('/');
        await expect.poll(() => page.getByTestId('signed-in-name').textContent()).toBe(person.name);
        await page.getByRole('heading', { level: 1, name: `Welcome, ${person.name.split(' ')[0]}` }).waitFor();

        const nav = page.getByRole('navigation', { name: 'Main' });
        for (const id of EVERYONE_NAV) await expect.poll(() => nav.getByTestId(id).isVisible()).toBe(true);
        for (const id of ADMIN_NAV) expect(await nav.getByTestId(id).count(), `${id} for ${role}`).toBe(admin ? 1 : 0);
        await screenshot(page, `home-${role}`);

        await page.getByTestId('sign-out').click();
        await page.waitForURL(portalUrl('/signed-out'));
        await page.getByRole('heading', { name: 'You have signed out' }).waitFor();
        expect(await page.getByTestId('signed-in-name').count()).toBe(0);

        await page.goto(portalUrl('/profile'));
        await page.waitForURL((url) => url.pathname === '/sign-in');
        expect(new URL(page.url()).searchParams.get('redirect')).toBe('/profile');

        // The provider's session ended with Localis's: signing in again asks for the password.
        expect(await startSignIn(page)).toBe('provider-form');
        expect(isProviderForm(new URL(page.url()))).toBe(true);
        expect(await page.locator('#password').isVisible()).toBe(true);
      });
    }
  });

  describe('deep links', () => {
    it('should land on the page asked for when a signed-out person opens it and signs in', async () => {
      const page = browser.page;
      await page.goto(portalUrl('/profile'));
      await page.waitForURL((url) => url.pathname === '/sign-in');
      expect(new URL(page.url()).searchParams.get('redirect')).toBe('/profile');

      await signIn(page, 'ines.albrecht@brennmoor.example', { fromCurrentPage: true });
      expect(pathOf(page.url())).toBe('/profile');
      await page.getByRole('heading', { level: 1, name: 'Your profile' }).waitFor();
      await expect.poll(() => page.getByTestId('profile-name').textContent()).toBe('Ines Albrecht');
    });
  });

  describe('roles', () => {
    it('should show the not-allowed page instead of the people table when a non-admin opens /admin/people', async () => {
      const page = browser.page;
      await signIn(page, 'tobias.wendt@brennmoor.example');

      await page.goto(portalUrl('/admin/people'));
      await page.waitForURL((url) => url.pathname === '/not-allowed');
      expect(new URL(page.url()).searchParams.get('from')).toBe('/admin/people');
      await page.getByRole('heading', { name: 'Your roles do not open this page' }).waitFor();
      await expect.poll(() => page.getByRole('main').textContent()).toContain('You hold: PI, Researcher.');
      expect(await page.getByTestId('people-table').count()).toBe(0);
      await screenshot(page, 'not-allowed-pi');
    });
  });

  describe('people Localis does not know', () => {
    it('should show the not-a-member page with the e-mail when someone known only to the provider signs in', async () => {
      const page = browser.page;
      await signIn(page, OUTSIDER.email, { member: false });
      await page.waitForURL((url) => url.pathname === '/not-a-member');
      await expect.poll(() => page.getByTestId('not-a-member-email').textContent()).toBe(OUTSIDER.email);
      expect(await page.getByTestId('signed-in-name').count()).toBe(0);
      await screenshot(page, 'not-a-member');

      // Nothing of Localis opens for them.
      await page.goto(portalUrl('/profile'));
      await page.waitForURL((url) => url.pathname === '/sign-in');
    });
  });

  describe('wrong password', () => {
    it("should show the provider's error and stay signed out when the password is wrong", async () => {
      const { page, expectFailure } = browser.session;
      expectFailure(/\/interaction\/[^/]+\/login$/, 401);
      await page.goto(portalUrl('/sign-in'));
      expect(await startSignIn(page)).toBe('provider-form');
      await submitProviderForm(page, 'ines.albrecht@brennmoor.example', 'not-the-password');

      const error = page.getByRole('alert');
      await error.waitFor();
      expect(await error.textContent()).toBe('That e-mail and password do not match an account.');
      expect(isProviderForm(new URL(page.url()))).toBe(true);
      // The form keeps the e-mail and empties the password.
      expect(await page.locator('#email').inputValue()).toBe('ines.albrecht@brennmoor.example');
      expect(await page.locator('#password').inputValue()).toBe('');
      await screenshot(page, 'provider-wrong-password');

      await page.goto(portalUrl('/'));
      await page.waitForURL((url) => url.pathname === '/sign-in');
      const session = await page.evaluate(() => fetch('/api/v1/session').then((r) => r.json()));
      expect(session).toMatchObject({ signedIn: false, person: null });
    });
  });
});
