import type { CreatedApiToken } from '@localis/shared';
import { flushPromises, mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import { afterEach, describe, expect, it, vi } from 'vitest';
import TokenCreatedDialog from './token-created-dialog.vue';

const created: CreatedApiToken = {
  token: {
    id: '7b0e8a34-3f2f-4a43-9a55-0f4f0b6c2d11',
    name: 'kestrel-cluster',
    prefix: 'lcs_Ab3d',
    scopes: ['read', 'runs'],
    expiresAt: '2026-06-01T00:00:00.000Z',
    lastUsedAt: null,
    revokedAt: null,
    createdAt: '2026-03-03T10:00:00.000Z',
  },
  secret: 'lcs_Ab3dQ9xv7Lw2mZr8T1pK4sN6yH0cJ5eG',
};

function mountDialog(value: CreatedApiToken | null) {
  return mount(TokenCreatedDialog, {
    props: { created: value },
    global: { plugins: [[PrimeVue, { theme: 'none' }]], stubs: { teleport: true } },
  });
}

describe('TokenCreatedDialog', () => {
  afterEach(() => {
    vi.unstubAllGlobals();
  });

  describe('showing the secret', () => {
    it('should show the secret and the warning that it will not be shown again when a token was created', async () => {
      const wrapper = mountDialog(created);
      await flushPromises();

      const input = wrapper.find<HTMLInputElement>('[data-testid="token-secret"]');
      expect(input.exists()).toBe(true);
      expect(input.element.value).toBe(created.secret);
      expect(input.attributes('readonly')).toBeDefined();
      expect(wrapper.find('[data-testid="token-secret-warning"]').text()).toMatch(/will not show it again/);
    });

    it('should render nothing of the secret when there is no created token', async () => {
      const wrapper = mountDialog(null);
      await flushPromises();

      expect(wrapper.find('[data-testid="token-secret"]').exists()).toBe(false);
      expect(wrapper.html()).not.toContain(created.secret);
    });

    it('should forget the secret when the parent clears the created token after close', async () => {
      const wrapper = mountDialog(created);
      await flushPromises();

      await wrapper.find('[data-testid="token-created-done"]').trigger('click');
      expect(wrapper.emitted('close')).toHaveLength(1);

      await wrapper.setProps({ created: null });
      await flushPromises();
      expect(wrapper.html()).not.toContain(created.secret);
    });
  });

  describe('copying', () => {
    it('should put the secret on the clipboard when Copy is pressed', async () => {
      const writeText = vi.fn().mockResolvedValue(undefined);
      vi.stubGlobal('navigator', { ...navigator, clipboard: { writeText } });
      const wrapper = mountDialog(created);
      await flushPromises();

      await wrapper.find('[data-testid="copy-secret"]').trigger('click');
      await flushPromises();

      expect(writeText).toHaveBeenCalledWith(created.secret);
      expect(wrapper.text()).toContain('Copied to the clipboard.');
    });

    it('should say how to copy by hand when the browser refuses the clipboard', async () => {
      vi.stubGlobal('navigator', { ...navigator, clipboard: { writeText: vi.fn().mockRejectedValue(new Error('denied')) } });
      const wrapper = mountDialog(created);
      await flushPromises();

      await wrapper.find('[data-testid="copy-secret"]').trigger('click');
      await flushPromises();

      expect(wrapper.text()).toContain('copy it by hand');
    });
  });
});
