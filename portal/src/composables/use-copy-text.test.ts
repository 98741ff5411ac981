import { flushPromises } from '@vue/test-utils';
import Toast from 'primevue/toast';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { defineComponent, h } from 'vue';
import { mountInApp, resetTestPage } from '../test/mount-in-app';
import { useCopyText } from './use-copy-text';

const COMMAND = 'localis tmm --dim 3 --width 6 --disorder 15 --energy 0 --precision 0.005 --seed 2718281';

/** A page with the toasts and nothing else, handing out its copyText. */
async function setup(writeText: (text: string) => Promise<void>) {
  vi.stubGlobal('navigator', { ...navigator, clipboard: { writeText } });
  let copyText!: ReturnType<typeof useCopyText>;
  const Probe = defineComponent({
    setup() {
      copyText = useCopyText();
      return () => h(Toast);
    },
  });
  const wrapper = await mountInApp(Probe);
  return { copyText, wrapper };
}

describe('useCopyText', () => {
  afterEach(() => resetTestPage());

  it('should put the text on the clipboard and say so in the words given', async () => {
    const writeText = vi.fn().mockResolvedValue(undefined);
    const { copyText, wrapper } = await setup(writeText);
    await copyText(COMMAND, { summary: 'Command copied', detail: COMMAND });
    await flushPromises();
    expect(writeText).toHaveBeenCalledExactlyOnceWith(COMMAND);
    expect(document.body.textContent).toContain('Command copied');
    wrapper.unmount();
  });

  it('should show the text to select by hand when the browser refuses the clipboard', async () => {
    const { copyText, wrapper } = await setup(vi.fn().mockRejectedValue(new DOMException('Write permission denied.', 'NotAllowedError')));
    await copyText(COMMAND, { summary: 'Command copied', detail: COMMAND });
    await flushPromises();
    expect(document.body.textContent).toContain('Could not copy');
    expect(document.body.textContent).toContain(`Select it instead: ${COMMAND}`);
    expect(document.body.textContent).not.toContain('Command copied');
    wrapper.unmount();
  });
});
