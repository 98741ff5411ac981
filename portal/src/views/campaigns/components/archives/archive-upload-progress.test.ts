import { afterEach, describe, expect, it } from 'vitest';
import { defineComponent, h } from 'vue';
import { mountInApp, resetTestPage } from '../../../../test/mount-in-app';
import type { UploadSession } from '../../composables/use-archive-upload';
import { CONNECTION_LOST, type UploadProgress } from '../../lib/archive-upload';
import ArchiveUploadProgress from './archive-upload-progress.vue';

const GB = 1_000_000_000;

function session(progress: Partial<UploadProgress>, cancelled = false): UploadSession {
  return {
    campaignId: '3a4b5c6d-7e8f-4a0b-9c1d-2e3f4a5b6c7d',
    file: new File(['x'], 'wc-sweep-L20.tar.gz'),
    kind: 'results',
    runIds: [],
    archive: null,
    cancelled,
    uploader: null as never,
    progress: { sentBytes: 0, totalBytes: GB, hashedBytes: 0, bytesPerSecond: 0, secondsLeft: null, state: 'uploading', ...progress },
  };
}

async function mountProgress(s: UploadSession) {
  const host = await mountInApp(defineComponent({ render: () => h(ArchiveUploadProgress, { session: s }) }));
  return host.getComponent(ArchiveUploadProgress);
}

describe('ArchiveUploadProgress', () => {
  afterEach(resetTestPage);

  describe('while sending', () => {
    it('should show the share done, the speed and the time left', async () => {
      const wrapper = await mountProgress(session({ sentBytes: 0.425 * GB, hashedBytes: 0.6 * GB, bytesPerSecond: 12_300_000, secondsLeft: 185 }));
      expect(wrapper.get('[data-testid="archive-upload-percent"]').text()).toBe('42 %');
      expect(wrapper.get('[data-testid="archive-upload-speed"]').text()).toBe('12 MB/s');
      expect(wrapper.get('[data-testid="archive-upload-left"]').text()).toBe('about 3 min');
      expect(wrapper.text()).toContain('Checksum read60 %');
      expect(wrapper.get('[role="progressbar"]').attributes('aria-valuenow')).toBe('42');
      expect(wrapper.text()).toContain('Result archive · 954 MiB');
      await wrapper.get('[data-testid="archive-upload-pause"]').trigger('click');
      expect(wrapper.emitted('pause')).toHaveLength(1);
    });
  });

  describe('when stopped', () => {
    it('should say why a dropped connection paused it and offer to resume', async () => {
      const wrapper = await mountProgress(session({ state: 'paused', error: CONNECTION_LOST, sentBytes: GB / 2 }));
      expect(wrapper.get('[data-testid="archive-upload-error"]').text()).toContain('The connection dropped');
      expect(wrapper.get('[data-testid="archive-upload-speed"]').text()).toBe('—');
      await wrapper.get('[data-testid="archive-upload-resume"]').trigger('click');
      expect(wrapper.emitted('resume')).toHaveLength(1);
    });

    it('should show a failure with a way to try again, but say nothing of one the person cancelled', async () => {
      const wrapper = await mountProgress(session({ state: 'failed', error: 'The store refused part 2 of 3 (HTTP 500) 6 times.' }));
      expect(wrapper.get('[data-testid="archive-upload-error"]').text()).toContain('part 2 of 3');
      await wrapper.get('[data-testid="archive-upload-retry"]').trigger('click');
      expect(wrapper.emitted('retry')).toHaveLength(1);

      const cancelled = await mountProgress(session({ state: 'failed', error: 'The upload was cancelled.' }, true));
      expect(cancelled.find('[data-testid="archive-upload-error"]').exists()).toBe(false);
    });
  });
});
